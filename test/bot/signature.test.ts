import { describe, expect, it } from 'vitest';
import { signSlackRequest, verifySlackRequest } from '../../src/bot/signature.ts';

// Worked example from the chat platform's "Verifying requests from Slack" documentation
// (https://api.slack.com/authentication/verifying-requests-from-slack): signing secret, timestamp,
// the slash-command body and the signature it publishes for them.
const SECRET = '8f742231b10e8888abcd99yyyzzz85a5';
const TIMESTAMP = 1531420618;
const BODY =
  'token=xyzz0WbapA4vBCDEFasx0q6G&team_id=T1DC2JH3J&team_domain=testteamnow&channel_id=G8PSS9T3V&channel_name=foobar&user_id=U2CERLKJA&user_name=roadrunner&command=%2Fwebhook-collect&text=&response_url=https%3A%2F%2Fhooks.slack.com%2Fcommands%2FT1DC2JH3J%2F397700885554%2F96rGlfmibIGlgcZRskXaIFfN&trigger_id=398738663015.47445629121.803a0bc887a14d10d2c447fce8b6703c';
const PUBLISHED = 'v0=a2114d57b48eac39b9ad189dd8316235a7b4a8d21a10bd27519666489c69b503';

describe('request signatures', () => {
  it('signs the published example exactly as the platform does', () => {
    expect(signSlackRequest(SECRET, TIMESTAMP, BODY)).toBe(PUBLISHED);
  });

  it('accepts the published example at its own timestamp', () => {
    const r = verifySlackRequest(
      SECRET,
      { signature: PUBLISHED, timestamp: String(TIMESTAMP), rawBody: BODY },
      TIMESTAMP,
    );
    expect(r).toEqual({ ok: true, value: true });
  });

  it('refuses a body changed by one character', () => {
    const tampered = BODY.replace('text=&', 'text=x&');
    const r = verifySlackRequest(
      SECRET,
      { signature: PUBLISHED, timestamp: String(TIMESTAMP), rawBody: tampered },
      TIMESTAMP,
    );
    expect(r.ok).toBe(false);
    expect(!r.ok && r.issues[0]?.code).toBe('signature_mismatch');
  });

  it('refuses a changed timestamp, a wrong secret and a missing header', () => {
    const at = (ts: number, secret = SECRET, sig = PUBLISHED) =>
      verifySlackRequest(secret, { signature: sig, timestamp: String(ts), rawBody: BODY }, TIMESTAMP);
    expect(at(TIMESTAMP + 1)).toMatchObject({ ok: false, issues: [{ code: 'signature_mismatch' }] });
    expect(at(TIMESTAMP, 'another-secret').ok).toBe(false);
    expect(
      verifySlackRequest(
        SECRET,
        { signature: undefined, timestamp: String(TIMESTAMP), rawBody: BODY },
        TIMESTAMP,
      ),
    ).toMatchObject({
      ok: false,
      issues: [{ code: 'signature_missing' }],
    });
  });

  it('refuses a correctly signed request older than five minutes, accepts one just inside', () => {
    const old = TIMESTAMP - 301;
    const signed = signSlackRequest(SECRET, old, BODY);
    const late = verifySlackRequest(
      SECRET,
      { signature: signed, timestamp: String(old), rawBody: BODY },
      TIMESTAMP,
    );
    expect(late).toMatchObject({ ok: false, issues: [{ code: 'timestamp_stale' }] });
    const edge = TIMESTAMP - 300;
    const fresh = signSlackRequest(SECRET, edge, BODY);
    expect(
      verifySlackRequest(SECRET, { signature: fresh, timestamp: String(edge), rawBody: BODY }, TIMESTAMP).ok,
    ).toBe(true);
  });
});
