import bcrypt from "bcryptjs";

/** bcrypt cost: 2^11 rounds keeps a sign-in near 100 ms on a small server. */
export const BCRYPT_COST = 11;

export { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from "./password-rules";

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

let dummyHash: string | undefined;

/**
 * Compare a password with a stored hash. With no stored hash (unknown e-mail, or a user who
 * only signs in by link) a dummy hash of the same cost is compared instead, so the answer
 * takes about as long either way and timing does not tell which addresses have accounts.
 */
export async function verifyPassword(password: string, storedHash: string | null | undefined): Promise<boolean> {
  dummyHash ??= bcrypt.hashSync("chainwright-dummy-password", BCRYPT_COST);
  const ok = await bcrypt.compare(password, storedHash ?? dummyHash);
  return ok && Boolean(storedHash);
}
