import bcrypt from 'bcryptjs';

/** bcrypt cost: about 50-100 ms a hash on a workshop PC, slow enough against guessing. */
const COST = 10;

/** Hashes a password with a fresh salt. */
export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

/** Whether `password` matches `hash`. */
export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

let dummyHash_: string | null = null;

/** A real hash of nothing anyone knows, compared against when the user does not exist. */
export function dummyHash(): string {
  dummyHash_ ??= bcrypt.hashSync('no such user', COST);
  return dummyHash_;
}
