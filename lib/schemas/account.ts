import { z } from './zod';

const email = z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address' }));
const password = z.string().min(10, 'Use at least 10 characters').max(200, 'Use at most 200 characters');

export const signInSchema = z.object({ email, password: z.string().min(1, 'Enter your password') });

export const registerSchema = z.object({
  name: z.string().trim().min(2, 'Enter your name as others should see it').max(100),
  email,
  password,
});

export const resetRequestSchema = z.object({ email });
export const resetConfirmSchema = z.object({ token: z.string().min(10).max(200), password, revokeTokens: z.boolean().optional() });

export const roleChangeSchema = z
  .object({ role: z.enum(['contributor', 'moderator', 'admin']).optional(), disabled: z.boolean().optional() })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, { message: 'Send a role or a disabled flag' });
export type RoleChange = z.output<typeof roleChangeSchema>;
