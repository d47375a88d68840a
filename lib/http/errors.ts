import { NextResponse } from 'next/server';
import { ZodError } from 'zod';
import { readCapped, parseJsonText, JSON_BODY_MAX } from './body';
import { isDatabaseUnavailable, RETRY_AFTER_SECONDS, UNAVAILABLE_SENTENCE } from './unavailable';

export type ErrorDetail = { line?: number; field?: string; message: string };

// Every refusal carries a status of docs/api.md §Errors and one readable sentence.
export class HttpError extends Error {
  constructor(
    public status: number,
    message: string,
    public details: ErrorDetail[] = [],
  ) {
    super(message);
  }
}

export const badRequest = (m: string, d?: ErrorDetail[]) => new HttpError(400, m, d);
export const unauthorised = (m = 'Sign in first.') => new HttpError(401, m);
export const forbidden = (m = 'Your role does not allow this.') => new HttpError(403, m);
export const notFound = (m = 'Not found.') => new HttpError(404, m);
export const conflict = (m: string) => new HttpError(409, m);
export const unprocessable = (m: string, d?: ErrorDetail[]) => new HttpError(422, m, d);

export function zodDetails(err: ZodError): ErrorDetail[] {
  return err.issues.map((i) => ({ field: i.path.join('.') || undefined, message: i.message }));
}

type StatusCarrier = { status: number; message: string; details?: unknown };

function carriesStatus(err: unknown): err is StatusCarrier {
  return (
    typeof err === 'object' && err !== null && typeof (err as StatusCarrier).status === 'number' &&
    (err as StatusCarrier).status >= 400 && (err as StatusCarrier).status < 500 && typeof (err as StatusCarrier).message === 'string'
  );
}

export function errorResponse(err: unknown): NextResponse {
  if (err instanceof ZodError) {
    const details = zodDetails(err);
    const first = details[0];
    const where = first?.field ? ` (${first.field})` : '';
    return NextResponse.json({ error: `The request is not valid: ${first?.message ?? 'bad input'}${where}.`, details }, { status: 422 });
  }
  // Engine and reader errors carry their own 4xx status and details.
  if (err instanceof HttpError || carriesStatus(err)) {
    const e = err as StatusCarrier;
    // A service of ours that is away (the file store, lib/storage/errors.ts): say when to come back.
    const headers: Record<string, string> = e.status === 503 ? { 'Retry-After': String(RETRY_AFTER_SECONDS) } : {};
    return NextResponse.json({ error: e.message, details: Array.isArray(e.details) ? e.details : [] }, { status: e.status, headers });
  }
  // A path or query with broken percent-encoding (e.g. %E0%A4%A) fails to decode: the client's fault.
  if (err instanceof URIError) {
    return NextResponse.json({ error: 'The address holds broken percent-encoding; encode it as UTF-8.', details: [] }, { status: 400 });
  }
  if (isDatabaseUnavailable(err)) {
    return NextResponse.json({ error: UNAVAILABLE_SENTENCE, details: [] }, { status: 503, headers: { 'Retry-After': String(RETRY_AFTER_SECONDS) } });
  }
  console.error(err);
  return NextResponse.json({ error: 'Something went wrong on our side; nothing was saved.', details: [] }, { status: 500 });
}

export function withErrors<A extends unknown[]>(fn: (...args: A) => Promise<Response>) {
  return async (...args: A): Promise<Response> => {
    try {
      return await fn(...args);
    } catch (err) {
      return errorResponse(err);
    }
  };
}

/**
 * Parses a JSON body of at most `maxBytes`, counted while it streams in (lib/http/body.ts).
 * The default fits every form of the API; routes that take whole curves pass a larger cap.
 */
export async function readJson(req: Request, maxBytes = JSON_BODY_MAX): Promise<unknown> {
  const bytes = await readCapped(req, maxBytes);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw badRequest('The request body is not valid UTF-8 text; send JSON.');
  }
  if (!text.trim()) throw badRequest('The request body is empty; send JSON.');
  return parseJsonText(text);
}
