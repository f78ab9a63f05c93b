// argon2id password hashing (@node-rs/argon2), plugged into the auth library and used by the seed.
import { hash, verify, Algorithm } from "@node-rs/argon2";

// OWASP's minimum for argon2id: 19 MiB, 2 passes, 1 lane.
const OPTIONS = { algorithm: Algorithm.Argon2id, memoryCost: 19_456, timeCost: 2, parallelism: 1 };

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
