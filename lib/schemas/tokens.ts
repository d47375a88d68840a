import { z } from './zod';

export const createTokenSchema = z.object({ name: z.string().trim().min(1, 'Name the token after where it will be used').max(100) });
