import bcrypt from 'bcryptjs';

const ROUNDS = process.env.BANDCONE_TEST ? 8 : 11;

export const hashPassword = (plain: string) => bcrypt.hash(plain, ROUNDS);
export const verifyPassword = (plain: string, hash: string) => bcrypt.compare(plain, hash);
