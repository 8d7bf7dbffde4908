import { describe, expect, it } from 'vitest';
import { parseEnv, startSlackFromEnv } from '../../src/main.ts';
import { signedPost, writeTestWorkspace } from './support.ts';

describe('chat app environment', () => {
  it('defaults to the console over the demo workspace', () => {
    expect(parseEnv({})).toMatchObject({
      ok: true,
      value: { PORT: 3000, SLOTWRIGHT_WORKSPACE: 'fixtures/demo' },
    });
  });

  it('accepts HTTP mode and Socket Mode', () => {
    expect(
      parseEnv({ SLACK_BOT_TOKEN: 'xoxb-1', SLACK_SIGNING_SECRET: 'abcdefgh12', PORT: '8080' }),
    ).toMatchObject({
      ok: true,
      value: { PORT: 8080 },
    });
    expect(parseEnv({ SLACK_BOT_TOKEN: 'xoxb-1', SLACK_APP_TOKEN: 'xapp-1' }).ok).toBe(true);
  });

  it('stops with a message naming each bad variable', () => {
    const r = parseEnv({ SLACK_BOT_TOKEN: 'xoxp-user', PORT: 'eighty', SLACK_API_URL: 'ftp://x' });
    expect(r.ok).toBe(false);
    const messages = r.ok ? [] : r.issues.map((i) => i.message);
    expect(messages).toContain('SLACK_BOT_TOKEN must start with xoxb-');
    expect(messages.some((m) => m.startsWith('PORT '))).toBe(true);
    expect(messages.some((m) => m.startsWith('SLACK_API_URL '))).toBe(true);
    expect(parseEnv({ SLACK_BOT_TOKEN: 'xoxb-1' })).toMatchObject({
      ok: false,
      issues: [
        { message: 'SLACK_SIGNING_SECRET is needed in HTTP mode (or set SLACK_APP_TOKEN for Socket Mode)' },
      ],
    });
    expect(parseEnv({ SLACK_APP_TOKEN: 'xapp-1' })).toMatchObject({
      ok: false,
      issues: [{ message: 'SLACK_BOT_TOKEN is needed when other SLACK_ variables are set' }],
    });
  });
});

describe('starting from the environment', () => {
  it('listens in HTTP mode on the given port and answers a signed url_verification', async () => {
    const env = parseEnv({
      SLACK_BOT_TOKEN: 'xoxb-env-test',
      SLACK_SIGNING_SECRET: 'env-test-signing-secret',
      PORT: '0',
      SLACK_API_URL: 'http://127.0.0.1:9/api/',
      SLOTWRIGHT_WORKSPACE: writeTestWorkspace(),
      SLOTWRIGHT_DATABASE_URL: ':memory:',
    });
    if (!env.ok || env.value.SLACK_BOT_TOKEN === undefined) throw new Error('expected a usable environment');
    const running = await startSlackFromEnv(
      { ...env.value, SLACK_BOT_TOKEN: env.value.SLACK_BOT_TOKEN },
      () => {},
    );
    try {
      expect(running.port).toBeGreaterThan(0);
      const r = await signedPost(
        running.port!,
        'env-test-signing-secret',
        JSON.stringify({ type: 'url_verification', challenge: 'z9' }),
        {
          contentType: 'application/json',
          timestamp: Math.floor(Date.now() / 1000),
        },
      );
      expect([r.status, JSON.parse(r.text)]).toEqual([200, { challenge: 'z9' }]);
    } finally {
      await running.stop();
    }
  });
});
