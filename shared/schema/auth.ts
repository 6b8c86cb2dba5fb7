import { z } from 'zod';

export const ROLE_NAMES = ['admin', 'engineer', 'reviewer', 'viewer'] as const;

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.'),
  password: z.string().min(1, 'Enter your password.').max(200),
});

export const passwordSchema = z.string().min(12, 'Use at least 12 characters.').max(200, 'Use at most 200 characters.');

export const setPasswordSchema = z.object({ token: z.string().min(10).max(200), password: passwordSchema });

export const inviteUserSchema = z.object({
  email: z.string().trim().toLowerCase().email('Enter an e-mail address.'),
  name: z.string().trim().min(1, 'Enter a name.').max(120),
  role: z.enum(ROLE_NAMES, 'Choose admin, engineer, reviewer or viewer.'),
});

export type SignInInput = z.infer<typeof signInSchema>;
export type InviteUserInput = z.infer<typeof inviteUserSchema>;
