import { hash, verify } from '@node-rs/argon2';

// argon2id (the library's default algorithm) with OWASP's suggested minimum cost:
// 19 MiB memory, 2 passes, 1 lane.
const OPTIONS = { memoryCost: 19_456, timeCost: 2, parallelism: 1 } as const;

/** Hashes a password with argon2id; the result carries its own salt and parameters. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

/** Checks a password against a stored hash; false (never a throw) for a malformed hash. */
export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
  try {
    return await verify(storedHash, password);
  } catch {
    return false;
  }
}

// A real hash of a random string, checked when the e-mail is unknown so that a wrong
// e-mail and a wrong password take the same time.
let decoy: Promise<string> | undefined;
export async function spendVerifyTime(password: string): Promise<void> {
  decoy ??= hashPassword(crypto.randomUUID());
  await verifyPassword(await decoy, password);
}
