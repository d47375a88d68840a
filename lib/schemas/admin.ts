import { z } from './zod';

// The admin pages keep their state in the URL; a value that does not read is dropped, never an error page.
const text = (max: number) => z.string().trim().max(max).optional().catch(undefined).transform((v) => (v ? v : undefined));
const day = z.iso.date().optional().catch(undefined);
const page = z.coerce.number().int().min(1).max(100_000).optional().catch(undefined).transform((v) => v ?? 1);

export const auditQuerySchema = z.object({
  actor: text(320),
  action: text(80),
  targetType: z.enum(['submission', 'curve', 'user', 'api_token']).optional().catch(undefined),
  target: text(80),
  from: day,
  to: day,
  page,
});
export type AuditQuery = z.output<typeof auditQuerySchema>;

export const usersQuerySchema = z.object({
  q: text(320),
  role: z.enum(['contributor', 'moderator', 'admin']).optional().catch(undefined),
  access: z.enum(['active', 'disabled']).optional().catch(undefined),
  page,
});
export type UsersQuery = z.output<typeof usersQuerySchema>;
