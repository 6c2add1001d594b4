import "server-only";
import { hash, verify } from "@node-rs/argon2";

// argon2id (the package default algorithm) with the OWASP-recommended minimum: 19 MiB, 2 passes, 1 lane.
const OPTIONS = { memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let dummyHash: Promise<string> | null = null;

/**
 * Spend the same time as a real verification when the account does not exist, so response times do
 * not reveal which e-mail addresses have accounts. Always returns false.
 */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummyHash ??= hashPassword("portolan-dummy-password-never-matches");
  await verifyPassword(await dummyHash, password);
  return false;
}
