// Password hashing with bcrypt (bcryptjs: pure JavaScript, no native build). Cost 11 is
// common practice for interactive sign-in on server hardware (about 0.1 s here).
import bcrypt from "bcryptjs";

const COST = 11;

export function hashPassword(password: string): Promise<string> {
  if (password.length < 10) throw new RangeError("password: at least 10 characters");
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}
