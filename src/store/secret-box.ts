import { createCipheriv, createDecipheriv, randomBytes } from 'node:crypto';
import { SlotwrightError } from '../errors.ts';

const VERSION = 'v1';

/**
 * Encrypts short secrets (feed URLs carry private tokens) with AES-256-GCM before they are stored.
 * The key is 32 bytes, given as base64 or base64url (SLOTWRIGHT_SECRET_KEY at the composition root).
 */
export class SecretBox {
  readonly #key: Buffer;

  /** Builds a box from a 32-byte key in base64/base64url; throws secret_key_invalid otherwise. */
  constructor(keyBase64: string) {
    const key = Buffer.from(keyBase64.trim(), 'base64');
    if (key.length !== 32)
      throw new SlotwrightError(
        'secret_key_invalid',
        `the secret key must be 32 bytes in base64 (got ${key.length} bytes); make one with: openssl rand -base64 32`,
      );
    this.#key = key;
  }

  /** Encrypts text; each call uses a fresh 12-byte nonce, so equal inputs give different outputs. */
  seal(plain: string): string {
    const iv = randomBytes(12);
    const cipher = createCipheriv('aes-256-gcm', this.#key, iv);
    const body = Buffer.concat([cipher.update(plain, 'utf8'), cipher.final()]);
    const tag = cipher.getAuthTag();
    return [VERSION, iv.toString('base64url'), tag.toString('base64url'), body.toString('base64url')].join(
      ':',
    );
  }

  /** Decrypts what seal produced; a wrong key or tampered text throws secret_key_invalid. */
  open(sealed: string): string {
    const [version, iv, tag, body] = sealed.split(':');
    if (version !== VERSION || iv === undefined || tag === undefined || body === undefined)
      throw new SlotwrightError('secret_key_invalid', 'a stored secret is not in the expected format');
    try {
      const decipher = createDecipheriv('aes-256-gcm', this.#key, Buffer.from(iv, 'base64url'));
      decipher.setAuthTag(Buffer.from(tag, 'base64url'));
      return Buffer.concat([decipher.update(Buffer.from(body, 'base64url')), decipher.final()]).toString(
        'utf8',
      );
    } catch (error) {
      throw new SlotwrightError(
        'secret_key_invalid',
        'a stored secret cannot be decrypted with this key; was SLOTWRIGHT_SECRET_KEY changed?',
        { cause: error },
      );
    }
  }
}
