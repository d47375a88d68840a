import { ConnectionError } from 'sequelize';

/**
 * Whether an error means "the database cannot be reached right now" rather than
 * "this request is wrong": the client should retry later, so the answer is a 503.
 *
 * PostgreSQL's SQLSTATE classes (PostgreSQL 15 manual, Appendix A):
 *   08xxx connection exception, 57P01 admin_shutdown, 57P02 crash_shutdown,
 *   57P03 cannot_connect_now (starting up or shutting down), 53300 too_many_connections.
 * Node's socket errors say the same before PostgreSQL can answer at all.
 */
const SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND', 'EAI_AGAIN']);
const SQLSTATES = new Set(['57P01', '57P02', '57P03', '53300']);
const MESSAGES = ['Connection terminated', 'connection timeout', 'Client has encountered a connection error', 'the database system is'];

function codeOf(err: unknown): string | undefined {
  const code = (err as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? code : undefined;
}

function messageOf(err: unknown): string {
  const m = (err as { message?: unknown } | null)?.message;
  return typeof m === 'string' ? m : '';
}

/** A socket that could not reach its service at all (the database, or the file store of lib/storage). */
export function isSocketFailure(err: unknown): boolean {
  const code = codeOf(err);
  return !!code && SOCKET_CODES.has(code);
}

export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 4) return false;
  if (err instanceof ConnectionError) return true;
  const code = codeOf(err);
  if (isSocketFailure(err) || (code && (SQLSTATES.has(code) || code.startsWith('08')))) return true;
  const message = messageOf(err);
  // Plain strings compared with includes: no pattern is run on anything a user wrote.
  if (MESSAGES.some((m) => message.includes(m))) return true;
  const e = err as { parent?: unknown; original?: unknown; cause?: unknown };
  return isDatabaseUnavailable(e.parent, depth + 1) || isDatabaseUnavailable(e.original, depth + 1) || isDatabaseUnavailable(e.cause, depth + 1);
}

/** Seconds a client should wait before trying again after a 503. */
export const RETRY_AFTER_SECONDS = 5;

export const UNAVAILABLE_SENTENCE = 'The library is briefly unavailable (its database cannot be reached); nothing was saved. Try again in a few seconds.';
