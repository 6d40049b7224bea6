import bcrypt from "bcryptjs";

/** bcrypt cost factor: about 60 ms per hash on a 2-core server, slow enough for stored hashes. */
const COST = 10;

export const MIN_PASSWORD_LENGTH = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

export function verifyPassword(plain: string, hash: string): Promise<boolean> {
  return bcrypt.compare(plain, hash);
}

/**
 * A valid hash to compare against when the user does not exist, so that a wrong e-mail and a
 * wrong password take the same time and reveal nothing.
 */
export const DUMMY_HASH = "$2b$10$CwTycUXWue0Thq9StjUM0uJ8.0vN0Ik5r5RJbTg1Lm3v7S9pu3uIa";
