import "server-only";
import bcrypt from "bcryptjs";
import { bcryptCost } from "@/lib/config";

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, bcryptCost());
}

// A hash of a random string, compared against when the e-mail address is unknown, so that a
// failed sign-in takes as long whether or not the account exists.
let dummyHash: string | undefined;

export async function verifyPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    dummyHash ??= await bcrypt.hash("headroom-no-such-account", bcryptCost());
    await bcrypt.compare(password, dummyHash);
    return false;
  }
  return bcrypt.compare(password, hash);
}
