import { ZodError } from 'zod';
import { zodDetails } from '@/lib/http/errors';

/** The one readable sentence a page shows for an error a route would answer with 4xx. */
export function errorMessage(err: unknown): string {
  if (err instanceof ZodError) {
    const first = zodDetails(err)[0];
    return `The search is not valid: ${first?.message ?? 'bad input'}${first?.field ? ` (${first.field})` : ''}.`;
  }
  if (err && typeof err === 'object' && typeof (err as { status?: unknown }).status === 'number' && (err as { status: number }).status < 500) {
    return (err as { message: string }).message;
  }
  throw err;
}
