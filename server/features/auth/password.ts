/**
 * Password hashing with scrypt from node:crypto (RFC 7914). Parameters follow the OWASP Password
 * Storage Cheat Sheet's scrypt row N=2^14, r=8, p=5 (about 16 MiB per hash). The stored form carries its
 * parameters, so they can be raised later and old hashes still verify:
 *   scrypt$<N>$<r>$<p>$<salt base64>$<hash base64>
 */
import { randomBytes, scrypt as scryptCallback, timingSafeEqual, type ScryptOptions } from 'node:crypto';

const KEY_LENGTH_BYTES = 32;
const SALT_LENGTH_BYTES = 16;
const DEFAULT_PARAMS = { N: 2 ** 14, r: 8, p: 5 } as const;

function scrypt(password: string, salt: Buffer, options: ScryptOptions): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    scryptCallback(password.normalize('NFKC'), salt, KEY_LENGTH_BYTES, { ...options, maxmem: 64 * 1024 * 1024 }, (error, key) =>
      error ? reject(error) : resolve(key),
    );
  });
}

export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(SALT_LENGTH_BYTES);
  const { N, r, p } = DEFAULT_PARAMS;
  const key = await scrypt(password, salt, { N, r, p });
  return ['scrypt', N, r, p, salt.toString('base64'), key.toString('base64')].join('$');
}

export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
  const [, n, r, p, saltText, hashText] = parts as [string, string, string, string, string, string];
  const expected = Buffer.from(hashText, 'base64');
  const key = await scrypt(password, Buffer.from(saltText, 'base64'), { N: Number(n), r: Number(r), p: Number(p) });
  return key.length === expected.length && timingSafeEqual(key, expected);
}

/** A hash of a random password, used to keep verify time constant when the e-mail is unknown. */
export const DUMMY_HASH_PROMISE = hashPassword(randomBytes(16).toString('hex'));
