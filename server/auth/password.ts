import bcrypt from 'bcryptjs';

/** bcrypt with cost 10: about 50 ms a hash here, slow enough to hurt guessing. */
const COST = 10;

export const hashPassword = (password: string) => bcrypt.hash(password, COST);
export const checkPassword = (password: string, hash: string) => bcrypt.compare(password, hash);
