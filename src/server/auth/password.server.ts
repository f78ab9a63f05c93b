// argon2id password hashing (@node-rs/argon2), plugged into the auth library and used by the seed.
import { hash, verify } from "@node-rs/argon2";

// The package's `Algorithm` is a const enum (no runtime object): 2 is `Algorithm.Argon2id`.
const ARGON2ID = 2;
// OWASP's minimum for argon2id: 19 MiB, 2 passes, 1 lane.
const OPTIONS = { algorithm: ARGON2ID, memoryCost: 19_456, timeCost: 2, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword({ hash: stored, password }: { hash: string; password: string }): Promise<boolean> {
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
