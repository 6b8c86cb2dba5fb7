import { Argon2id } from 'oslo/password';

const argon2id = new Argon2id();

export const hashPassword = (password: string) => argon2id.hash(password);
export const verifyPassword = (hash: string, password: string) => argon2id.verify(hash, password);

// Verified against when the e-mail is unknown, so a wrong e-mail costs the same work as a wrong password.
let dummyHash: Promise<string> | null = null;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= argon2id.hash('voltfall-no-such-user');
  return dummyHash;
}
