import { HttpError, badRequest } from './errors';


// Bodies are counted as they arrive and cut off at the cap: a Content-Length can be left out
// (chunked transfer) or be a lie, so it only lets us refuse early, never lets us trust.

/** JSON forms (accounts, optics, notes, reviews): generous for any of them. */
export const JSON_BODY_MAX = 256 * 1024;
/** JSON bodies holding a whole curve (200 000 points at most, as lib/schemas/model.ts allows). */
export const POINTS_BODY_MAX = 12 * 1024 * 1024;

function tooLarge(maxBytes: number, what: string): HttpError {
  const size = maxBytes >= 1048576 ? `${(maxBytes / 1048576).toFixed(0)} MB` : `${(maxBytes / 1024).toFixed(0)} KB`;
  return new HttpError(413, `${what} is over ${size}; send less.`);
}

function announcedLength(req: Request): number | null {
  const raw = req.headers.get('content-length');
  if (raw === null) return null;
  const n = Number(raw);
  return Number.isFinite(n) && n >= 0 ? n : null;
}

// A client that announced a body a little over the cap is still sending it when we answer;
// reading (and dropping) that much lets it read the 413 instead of a reset connection.
const DRAIN_MAX = 1024 * 1024;

async function drain(req: Request, limit: number) {
  const reader = req.body?.getReader();
  if (!reader) return;
  let seen = 0;
  try {
    while (seen <= limit) {
      const { done, value } = await reader.read();
      if (done) return;
      seen += value.byteLength;
    }
  } catch {
    // the client went away: nothing to answer
  } finally {
    await reader.cancel().catch(() => undefined);
  }
}

/** Refuses a body whose announced length is over the cap, before keeping any of it. */
async function refuseAnnounced(req: Request, maxBytes: number, what: string) {
  const length = announcedLength(req);
  if (length === null || length <= maxBytes) return;
  if (length - maxBytes <= DRAIN_MAX) await drain(req, length);
  throw tooLarge(maxBytes, what);
}

/**
 * The body as a stream that errors with a 413 once more than `maxBytes` have passed, so a
 * reader built on it (formData, text) never holds more than the cap.
 */
export function cappedStream(req: Request, maxBytes: number, what = 'The request body'): ReadableStream<Uint8Array> | null {
  if (!req.body) return null;
  let seen = 0;
  return req.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        seen += chunk.byteLength;
        if (seen > maxBytes) controller.error(tooLarge(maxBytes, what));
        else controller.enqueue(chunk);
      },
    }),
  );
}

/** Reads the whole body, at most `maxBytes`, refusing with 413 the moment it passes the cap. */
export async function readCapped(req: Request, maxBytes: number, what = 'The request body'): Promise<Uint8Array> {
  await refuseAnnounced(req, maxBytes, what);
  const stream = cappedStream(req, maxBytes, what);
  if (!stream) return new Uint8Array(0);
  const reader = stream.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks.push(value);
      total += value.byteLength;
    }
  } catch (err) {
    await reader.cancel().catch(() => undefined);
    throw err instanceof HttpError ? err : badRequest('The request body could not be read.');
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** A multipart body parsed into FormData, never buffering more than `maxBytes`. */
export async function readFormCapped(req: Request, maxBytes: number, what = 'The upload'): Promise<FormData> {
  await refuseAnnounced(req, maxBytes, what);
  const stream = cappedStream(req, maxBytes, what);
  if (!stream) throw badRequest('The multipart body is empty.');
  const counted = new Request(req.url, { method: 'POST', headers: req.headers, body: stream, duplex: 'half' } as RequestInit);
  let failure: unknown;
  const form = await counted.formData().catch((err: unknown) => {
    failure = err;
    return null;
  });
  if (form) return form;
  // undici wraps the stream's error; find our 413 inside it.
  let e: unknown = failure;
  for (let depth = 0; e && depth < 4; depth++) {
    if (e instanceof HttpError) throw e;
    e = (e as { cause?: unknown }).cause;
  }
  throw badRequest('The multipart body could not be read.');
}

/** No form of the API nests deeper than a handful of levels; hostile JSON nests millions deep. */
export const JSON_MAX_DEPTH = 32;

/**
 * Whether a JSON text nests no deeper than `maxDepth`, by one linear scan that skips strings,
 * so a deep body is refused before JSON.parse builds millions of nested arrays.
 */
export function jsonDepthWithin(text: string, maxDepth = JSON_MAX_DEPTH): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92 /* \ */) i++;
      else if (c === 34 /* " */) inString = false;
    } else if (c === 34) {
      inString = true;
    } else if (c === 91 /* [ */ || c === 123 /* { */) {
      if (++depth > maxDepth) return false;
    } else if (c === 93 /* ] */ || c === 125 /* } */) {
      depth--;
    }
  }
  return true;
}

/** JSON text from a client, parsed with its depth bounded first; `what` names it in the refusal. */
export function parseJsonText(text: string, what = 'The request body'): unknown {
  if (!jsonDepthWithin(text)) throw badRequest(`${what} nests deeper than ${JSON_MAX_DEPTH} levels; no request of this API needs that.`);
  try {
    return JSON.parse(text);
  } catch {
    throw badRequest(`${what} is not valid JSON.`);
  }
}
