import 'server-only';
import bcrypt from 'bcryptjs';

// bcrypt cost 11: about 0.1 s per check on this machine class; slows guessing without hurting sign-in.
const COST = 11;

export const hashPassword = (plain: string): Promise<string> => bcrypt.hash(plain, COST);
export const verifyPassword = (plain: string, hash: string): Promise<boolean> => bcrypt.compare(plain, hash);

// A constant-cost dummy compare for unknown accounts, so response time does not reveal which e-mails exist.
let dummy: string | null = null;
export async function burnPasswordCheck(plain: string): Promise<boolean> {
  dummy ??= await bcrypt.hash('stochos-dummy-password', COST);
  return bcrypt.compare(plain, dummy);
}
