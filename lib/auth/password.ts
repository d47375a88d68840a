import bcrypt from 'bcryptjs';

const ROUNDS = process.env.BANDCONE_TEST ? 8 : 11;

export const hashPassword = (plain: string) => bcrypt.hash(plain, ROUNDS);
export const verifyPassword = (plain: string, hash: string) => bcrypt.compare(plain, hash);

// A hash of nothing anyone knows, at the same cost as real ones: comparing against it when
// there is no account (or no password) makes a refusal take as long as a wrong password.
let dummy: Promise<string> | undefined;
const dummyHash = () => (dummy ??= bcrypt.hash(`no account ${Math.random()}`, ROUNDS));

/** Always runs one bcrypt comparison, whether or not there is a hash to compare with. */
export async function passwordMatches(plain: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    await bcrypt.compare(plain, await dummyHash());
    return false;
  }
  return bcrypt.compare(plain, hash);
}
