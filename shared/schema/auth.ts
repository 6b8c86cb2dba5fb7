import { z } from 'zod';

export const ROLE_NAMES = ['admin', 'engineer', 'reviewer', 'viewer'] as const;

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.'),
  password: z.string().min(1, 'Enter your password.').max(200),
});

export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_LENGTH = 128;

/** Characters that count towards the minimum: ends trimmed, runs of spaces counted once (ASVS 2.1.1). */
export const passwordLength = (password: string) => [...password.trim().replace(/\s+/g, ' ')].length;

// The shape only; the server also judges how guessable the password is and says why in the field error.
export const passwordSchema = z
  .string()
  .max(MAX_PASSWORD_LENGTH, `Use at most ${MAX_PASSWORD_LENGTH} characters.`)
  .refine(
    (p) => passwordLength(p) >= MIN_PASSWORD_LENGTH,
    `Use at least ${MIN_PASSWORD_LENGTH} characters; spaces at the ends and repeated spaces do not count.`,
  );

export const setPasswordSchema = z.object({ token: z.string().min(10).max(200), password: passwordSchema });

export const forgotPasswordSchema = z.object({ email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254) });

export const inviteUserSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.'),
  name: z.string().trim().min(1, 'Enter a name.').max(120),
  role: z.enum(ROLE_NAMES, 'Choose admin, engineer, reviewer or viewer.'),
});

export type SignInInput = z.infer<typeof signInSchema>;
export type InviteUserInput = z.infer<typeof inviteUserSchema>;
