import { createCipheriv, createDecipheriv, randomBytes } from 'node:crypto';
import { chmodSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { SlotwrightError } from '../errors.ts';

// Feed URLs carry the token that grants read access to someone's calendar, so they are stored
// sealed with AES-256-GCM: "v1." + base64url(12-byte IV | 16-byte tag | ciphertext).
const PREFIX = 'v1.';
const KEY_FILE = 'secret.key';

function parseKey(text: string, where: string): Buffer {
  const t = text.trim();
  const key = /^[0-9a-fA-F]{64}$/.test(t) ? Buffer.from(t, 'hex') : Buffer.from(t, 'base64');
  if (
    key.length !== 32 ||
    (!/^[0-9a-fA-F]{64}$/.test(t) && key.toString('base64').replace(/=+$/, '') !== t.replace(/=+$/, ''))
  )
    throw new SlotwrightError(
      'secret_key_invalid',
      `${where} must be 32 bytes written as 64 hex digits or base64 (for example: openssl rand -base64 32)`,
    );
  return key;
}

/** Where the secret key comes from and what to tell the admin. */
export interface SecretKeySource {
  /** Environment (SLOTWRIGHT_SECRET_KEY is read from it). */
  readonly env: Readonly<Record<string, string | undefined>>;
  /** Data folder; a generated key is kept in `<dataDir>/secret.key` (mode 0600). */
  readonly dataDir: string;
  /** Receives the one-time notice when a key is generated. @default no notice */
  readonly warn?: (message: string) => void;
}

/**
 * The 32-byte key that seals feed URLs: SLOTWRIGHT_SECRET_KEY when set (base64 or hex), else the
 * key file in the data folder, generated on first run with a warning.
 */
export function loadSecretKey(source: SecretKeySource): Buffer {
  const fromEnv = source.env.SLOTWRIGHT_SECRET_KEY;
  if (fromEnv !== undefined && fromEnv.trim() !== '') return parseKey(fromEnv, 'SLOTWRIGHT_SECRET_KEY');
  const file = join(source.dataDir, KEY_FILE);
  let text: string | undefined;
  try {
    text = readFileSync(file, 'utf8');
  } catch {
    text = undefined;
  }
  if (text !== undefined) return parseKey(text, file);
  const key = randomBytes(32);
  mkdirSync(source.dataDir, { recursive: true });
  writeFileSync(file, `${key.toString('base64')}\n`, { mode: 0o600, flag: 'wx' });
  chmodSync(file, 0o600);
  source.warn?.(
    `SLOTWRIGHT_SECRET_KEY is not set: generated a key in ${file}. Back it up; without it stored feed URLs cannot be read.`,
  );
  return key;
}

/** Seals a secret (such as a feed URL) with AES-256-GCM. */
export function sealSecret(plain: string, key: Buffer): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', key, iv);
  const data = Buffer.concat([cipher.update(plain, 'utf8'), cipher.final()]);
  return PREFIX + Buffer.concat([iv, cipher.getAuthTag(), data]).toString('base64url');
}

/** Opens a sealed secret; a wrong key or a changed value gives a clear error, never garbage. */
export function openSecret(sealed: string, key: Buffer): string {
  if (!sealed.startsWith(PREFIX))
    throw new SlotwrightError('secret_key_invalid', 'stored secret has an unknown format (expected v1.)');
  const raw = Buffer.from(sealed.slice(PREFIX.length), 'base64url');
  if (raw.length < 28) throw new SlotwrightError('secret_key_invalid', 'stored secret is truncated');
  try {
    const decipher = createDecipheriv('aes-256-gcm', key, raw.subarray(0, 12));
    decipher.setAuthTag(raw.subarray(12, 28));
    return Buffer.concat([decipher.update(raw.subarray(28)), decipher.final()]).toString('utf8');
  } catch (error) {
    throw new SlotwrightError(
      'secret_key_invalid',
      'a stored secret cannot be opened with this key (was SLOTWRIGHT_SECRET_KEY or secret.key changed?)',
      { cause: error },
    );
  }
}
