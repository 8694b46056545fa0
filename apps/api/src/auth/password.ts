// Password hashing with argon2id (@node-rs/argon2).
import { randomBytes } from "node:crypto";
import { hash, verify } from "@node-rs/argon2";

// OWASP password storage cheat sheet, argon2id: m = 19 MiB, t = 2, p = 1.
const options = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, options);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let decoyHash: Promise<string> | undefined;

/**
 * Spends the same time as a real check when there is no hash to check against (unknown
 * e-mail, invitation not yet accepted), so response time does not tell which it was.
 */
export async function verifyAgainstDecoy(password: string): Promise<false> {
  decoyHash ??= hashPassword(randomBytes(16).toString("hex"));
  await verifyPassword(await decoyHash, password);
  return false;
}
