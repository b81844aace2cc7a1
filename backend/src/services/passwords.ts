// Password hashing with node:crypto scrypt. The stored string carries its parameters
// (`scrypt$N=…,r=…,p=…$salt$hash`), so the cost can be raised later and old hashes still verify;
// `needsRehash` tells the sign-in path when to upgrade one.
import { randomBytes, scrypt as scryptCallback, timingSafeEqual, type ScryptOptions } from 'node:crypto';

export interface ScryptParams {
  N: number;
  r: number;
  p: number;
}

/** Today's cost: 2^14 rounds with r=8 needs 16 MiB and about 50 ms here. */
export const currentParams: ScryptParams = { N: 2 ** 14, r: 8, p: 1 };
const keyLength = 32;
const saltLength = 16;

function scrypt(password: string, salt: Buffer, params: ScryptParams): Promise<Buffer> {
  const options: ScryptOptions = { ...params, maxmem: 128 * params.N * params.r * params.p + 1024 * 1024 };
  return new Promise((resolve, reject) => {
    scryptCallback(password.normalize('NFKC'), salt, keyLength, options, (err, key) => (err ? reject(err) : resolve(key)));
  });
}

export async function hashPassword(password: string, params: ScryptParams = currentParams): Promise<string> {
  const salt = randomBytes(saltLength);
  const key = await scrypt(password, salt, params);
  return `scrypt$N=${params.N},r=${params.r},p=${params.p}$${salt.toString('base64')}$${key.toString('base64')}`;
}

interface ParsedHash {
  params: ScryptParams;
  salt: Buffer;
  key: Buffer;
}

export function parseHash(stored: string): ParsedHash | null {
  const m = /^scrypt\$N=(\d+),r=(\d+),p=(\d+)\$([A-Za-z0-9+/=]+)\$([A-Za-z0-9+/=]+)$/.exec(stored);
  if (!m) return null;
  const params = { N: Number(m[1]), r: Number(m[2]), p: Number(m[3]) };
  // Refuse absurd parameters rather than let a bad row burn memory.
  if (params.N < 2 || params.N > 2 ** 20 || (params.N & (params.N - 1)) !== 0 || params.r < 1 || params.r > 32 || params.p < 1 || params.p > 16) {
    return null;
  }
  return { params, salt: Buffer.from(m[4]!, 'base64'), key: Buffer.from(m[5]!, 'base64') };
}

export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const parsed = parseHash(stored);
  if (!parsed || parsed.key.length === 0) return false;
  const key = await scrypt(password, parsed.salt, parsed.params);
  return key.length === parsed.key.length && timingSafeEqual(key, parsed.key);
}

export function needsRehash(stored: string, params: ScryptParams = currentParams): boolean {
  const parsed = parseHash(stored);
  return !parsed || parsed.params.N < params.N || parsed.params.r < params.r || parsed.params.p < params.p;
}

let dummy: Promise<string> | undefined;
/**
 * Burns the same time as a real check, for unknown e-mails and accounts without a password, so the
 * response time does not reveal whether an account exists.
 */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummy ??= hashPassword('not-a-real-password-' + randomBytes(8).toString('hex'));
  await verifyPassword(password, await dummy);
  return false;
}
