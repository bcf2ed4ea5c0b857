import { randomBytes, scrypt as scryptCallback, timingSafeEqual, type ScryptOptions } from 'node:crypto';

function scrypt(password: string, salt: Buffer, keylen: number, options: ScryptOptions): Promise<Buffer> {
  return new Promise((resolve, reject) =>
    scryptCallback(password, salt, keylen, options, (err, key) => (err ? reject(err) : resolve(key))),
  );
}

const KEY_LENGTH = 32;
// scrypt block size r=8, parallelism p=1 (RFC 7914 §2 recommends r=8, p=1 for interactive logins).
const BLOCK_SIZE = 8;
const PARALLELISM = 1;

/** Format: scrypt$<log2 N>$<r>$<p>$<salt b64>$<key b64>, so the cost can rise later without breaking old hashes. */
export async function hashPassword(password: string, log2Cost: number): Promise<string> {
  const salt = randomBytes(16);
  const N = 2 ** log2Cost;
  const key = await scrypt(password.normalize('NFKC'), salt, KEY_LENGTH, {
    N,
    r: BLOCK_SIZE,
    p: PARALLELISM,
    maxmem: 256 * N * BLOCK_SIZE,
  });
  return ['scrypt', log2Cost, BLOCK_SIZE, PARALLELISM, salt.toString('base64'), key.toString('base64')].join('$');
}

export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const [scheme, log2, r, p, saltB64, keyB64] = stored.split('$');
  if (scheme !== 'scrypt' || !log2 || !r || !p || !saltB64 || !keyB64) return false;
  const N = 2 ** Number(log2);
  const expected = Buffer.from(keyB64, 'base64');
  const actual = await scrypt(password.normalize('NFKC'), Buffer.from(saltB64, 'base64'), expected.length, {
    N,
    r: Number(r),
    p: Number(p),
    maxmem: 256 * N * Number(r),
  });
  return actual.length === expected.length && timingSafeEqual(actual, expected);
}

/**
 * Unknown e-mail addresses still pay for one hash, so the time a sign-in takes
 * does not tell an attacker whether the account exists.
 */
export function dummyHashFor(log2Cost: number): Promise<string> {
  return hashPassword(randomBytes(12).toString('hex'), log2Cost);
}
