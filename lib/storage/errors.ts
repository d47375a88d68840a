import { HttpError } from '@/lib/http/errors';
import { RETRY_AFTER_SECONDS, isSocketFailure } from '@/lib/http/unavailable';

// The bucket is a service of its own: when it cannot be reached (refused, timed out, or it
// answers 5xx) the request gets a 503 with Retry-After and a plain sentence, never a 500.

export const STORE_DOWN_UPLOAD = 'The file store is briefly unavailable; nothing was saved. Try again in a few seconds.';
export const STORE_DOWN_DOWNLOAD = 'The raw file cannot be fetched right now (the file store is unavailable). Try again in a few seconds.';

type SdkError = { name?: string; code?: string; $metadata?: { httpStatusCode?: number }; $fault?: string; cause?: unknown };

export function isStorageUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 4) return false;
  const e = err as SdkError;
  if (isSocketFailure(err)) return true;
  if (e.name === 'TimeoutError' || e.name === 'RequestTimeout' || e.name === 'AbortError') return true;
  const status = e.$metadata?.httpStatusCode;
  if (typeof status === 'number' && status >= 500) return true;
  return isStorageUnavailable(e.cause, depth + 1);
}

export function isMissingObject(err: unknown): boolean {
  const e = err as SdkError | null;
  return !!e && (e.name === 'NoSuchKey' || e.name === 'NotFound' || e.$metadata?.httpStatusCode === 404);
}

/** Runs a bucket call; an outage becomes a 503 with `sentence`, anything else goes on as it was. */
export async function guarded<T>(sentence: string, call: () => Promise<T>): Promise<T> {
  try {
    return await call();
  } catch (err) {
    if (isStorageUnavailable(err)) throw new HttpError(503, sentence);
    throw err;
  }
}

export { RETRY_AFTER_SECONDS };
