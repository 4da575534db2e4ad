import bcrypt from "bcryptjs";

// Cost 12 takes a few hundred milliseconds: slow for guessing, fine for one sign-in.
export const passwordHashCost = 12;
export const minimumPasswordLength = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, passwordHashCost);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

let decoyHash: Promise<string> | undefined;

/** Compared against when the e-mail is unknown, so both failures take the same time. */
export function unknownUserHash(): Promise<string> {
  decoyHash ??= hashPassword("no such member");
  return decoyHash;
}
