import { randomBytes, scrypt, timingSafeEqual, type ScryptOptions } from "node:crypto";

/**
 * Passwords are hashed with scrypt, a per-user random salt, and the parameters stored beside
 * the hash so they can be raised later without breaking existing accounts:
 *   scrypt$<N>$<r>$<p>$<salt base64url>$<hash base64url>
 * N = 2^15, r = 8, p = 1 uses 32 MiB per hash (RFC 7914 §2 parameter meaning; cost chosen
 * for a 2-core server, common practice, no source).
 */
const PARAMETERS = { N: 2 ** 15, r: 8, p: 1 };
const KEY_LENGTH = 64;

function derive(password: string, salt: Buffer, options: ScryptOptions, length: number): Promise<Buffer> {
  return new Promise((resolve, reject) =>
    scrypt(password.normalize("NFKC"), salt, length, { ...options, maxmem: 256 * 1024 * 1024 }, (error, key) =>
      error ? reject(error) : resolve(key),
    ),
  );
}

export async function hashPassword(password: string): Promise<string> {
  const salt = randomBytes(16);
  const key = await derive(password, salt, PARAMETERS, KEY_LENGTH);
  const { N, r, p } = PARAMETERS;
  return ["scrypt", N, r, p, salt.toString("base64url"), key.toString("base64url")].join("$");
}

export async function verifyPassword(password: string, stored: string): Promise<boolean> {
  const [scheme, N, r, p, salt, hash] = stored.split("$");
  if (scheme !== "scrypt" || !salt || !hash) return false;
  const expected = Buffer.from(hash, "base64url");
  const actual = await derive(password, Buffer.from(salt, "base64url"), { N: Number(N), r: Number(r), p: Number(p) }, expected.length);
  return timingSafeEqual(actual, expected);
}

// A hash to compare against when the account does not exist, so that a wrong e-mail address
// takes as long as a wrong password and the answer time does not reveal who has an account.
let decoy: Promise<string> | undefined;
export function decoyPasswordHash(): Promise<string> {
  decoy ??= hashPassword(randomBytes(12).toString("hex"));
  return decoy;
}
