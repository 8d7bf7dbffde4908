import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { loadSecretKey, openSecret, sealSecret } from '../../src/calendar/feed-secret.ts';
import { SlotwrightError } from '../../src/errors.ts';

const dirs: string[] = [];
const tmp = () => {
  const d = mkdtempSync(join(tmpdir(), 'slotwright-secret-'));
  dirs.push(d);
  return d;
};
afterEach(() => {
  for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

const URL_SECRET = 'https://cal.saltline.example/u/maren/private-9f8e7d/basic.ics';

describe('sealSecret / openSecret', () => {
  const key = Buffer.alloc(32, 7);
  it('round-trips and never stores the plain text', () => {
    const sealed = sealSecret(URL_SECRET, key);
    expect(sealed.startsWith('v1.')).toBe(true);
    expect(sealed).not.toContain('saltline');
    expect(openSecret(sealed, key)).toBe(URL_SECRET);
    // a fresh IV each time (NIST SP 800-38D: an IV must never repeat under one key)
    expect(sealSecret(URL_SECRET, key)).not.toBe(sealed);
  });
  it('refuses a wrong key and a changed value', () => {
    const sealed = sealSecret(URL_SECRET, key);
    expect(() => openSecret(sealed, Buffer.alloc(32, 8))).toThrow(SlotwrightError);
    // (the character replaced is the second to last, so that is the one to compare: comparing the last
    // one left the value unchanged whenever the second to last was already an A, one run in 64)
    const flipped = `${sealed.slice(0, -2)}${sealed.at(-2) === 'A' ? 'B' : 'A'}${sealed.slice(-1)}`;
    expect(flipped).not.toBe(sealed);
    expect(() => openSecret(flipped, key)).toThrow(/cannot be opened/);
    expect(() => openSecret('plain', key)).toThrow(/unknown format/);
  });
});

describe('loadSecretKey', () => {
  it('reads SLOTWRIGHT_SECRET_KEY as hex or base64', () => {
    const hex = 'ab'.repeat(32);
    expect(loadSecretKey({ env: { SLOTWRIGHT_SECRET_KEY: hex }, dataDir: tmp() })).toEqual(
      Buffer.from(hex, 'hex'),
    );
    const b64 = Buffer.alloc(32, 3).toString('base64');
    expect(loadSecretKey({ env: { SLOTWRIGHT_SECRET_KEY: b64 }, dataDir: tmp() })).toEqual(
      Buffer.alloc(32, 3),
    );
  });
  it('gives a clear error for a key of the wrong size', () => {
    expect(() => loadSecretKey({ env: { SLOTWRIGHT_SECRET_KEY: 'short' }, dataDir: tmp() })).toThrow(
      /must be 32 bytes written as 64 hex digits or base64/,
    );
  });
  it('generates a key file with mode 0600 once, with a warning, and reuses it', () => {
    const dir = tmp();
    const warnings: string[] = [];
    const k1 = loadSecretKey({ env: {}, dataDir: dir, warn: (m) => warnings.push(m) });
    const k2 = loadSecretKey({ env: {}, dataDir: dir, warn: (m) => warnings.push(m) });
    expect(k1).toEqual(k2);
    expect(k1.length).toBe(32);
    expect(warnings).toHaveLength(1);
    expect(statSync(join(dir, 'secret.key')).mode & 0o777).toBe(0o600);
    expect(readFileSync(join(dir, 'secret.key'), 'utf8').trim()).toBe(k1.toString('base64'));
  });
});
