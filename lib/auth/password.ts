import bcrypt from "bcryptjs";
import { z } from "zod";
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from "./password-rules";

/** bcrypt cost: 2^11 rounds keeps a sign-in near 100 ms on a small server. */
export const BCRYPT_COST = 11;

export { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH };

/** The two fields every way of creating an account asks for, checked alike whichever form sent them. */
export const accountNameSchema = z.string().trim().min(1, "enter your name").max(100, "at most 100 characters");
export const newPasswordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `at least ${PASSWORD_MIN_LENGTH} characters`)
  .max(PASSWORD_MAX_LENGTH, `at most ${PASSWORD_MAX_LENGTH} characters`);

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
