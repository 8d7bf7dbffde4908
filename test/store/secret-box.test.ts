import { createDecipheriv } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { SecretBox } from '../../src/store/index.ts';

const KEY = Buffer.alloc(32, 5);

describe('SecretBox', () => {
  const box = new SecretBox(KEY.toString('base64'));
  const url = 'https://calendar.saltline.example/private/token-abc/basic.ics';

  it('round-trips, and equal inputs seal differently (fresh nonce each time)', () => {
    const a = box.seal(url);
    const b = box.seal(url);
    expect(a).not.toBe(b);
    expect(box.open(a)).toBe(url);
    expect(box.open(b)).toBe(url);
    expect(a).not.toContain('saltline');
  });

  it('is plain AES-256-GCM that node:crypto opens independently', () => {
    const [, iv, tag, body] = box.seal(url).split(':');
    const d = createDecipheriv('aes-256-gcm', KEY, Buffer.from(iv!, 'base64url'));
    d.setAuthTag(Buffer.from(tag!, 'base64url'));
    expect(Buffer.concat([d.update(Buffer.from(body!, 'base64url')), d.final()]).toString('utf8')).toBe(url);
  });

  it('refuses a tampered text and a wrong key', () => {
    const sealed = box.seal(url);
    const parts = sealed.split(':');
    const body = Buffer.from(parts[3]!, 'base64url');
    body[0] = body[0]! ^ 1;
    parts[3] = body.toString('base64url');
    expect(() => box.open(parts.join(':'))).toThrow(/cannot be decrypted/);
    expect(() => new SecretBox(Buffer.alloc(32, 6).toString('base64')).open(sealed)).toThrow(
      /cannot be decrypted/,
    );
    expect(() => box.open('plain-text')).toThrow(/not in the expected format/);
  });

  it('needs a 32-byte key and says how to make one', () => {
    expect(() => new SecretBox(Buffer.alloc(16).toString('base64'))).toThrow(
      'the secret key must be 32 bytes in base64 (got 16 bytes); make one with: openssl rand -base64 32',
    );
  });
});
