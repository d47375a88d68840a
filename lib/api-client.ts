/**
 * The browser's one way to call the API. Each function takes what the handler's
 * zod schema accepts (`z.input`) and answers with what the handler sends back,
 * both taken from the server's own code as types only: nothing server-side
 * reaches the bundle (eslint.config.mjs keeps it so). Every refusal is decoded in
 * one place (`decodeResponse`) into the error body of docs/api.md §Errors.
 */
import type { z } from 'zod';
import type { ErrorDetail } from '@/lib/http/errors';
import type { registerSchema, resetConfirmSchema, resetRequestSchema, roleChangeSchema } from '@/lib/schemas/account';
import type { createTokenSchema } from '@/lib/schemas/tokens';
import type { coneRequestSchema, neffRequestSchema, readerOptionsSchema } from '@/lib/schemas/model';
import type { opticInputSchema, opticPatchSchema } from '@/lib/schemas/optics';
import type { previewMetadataSchema, reviewDecisionSchema, threadReplySchema } from '@/lib/schemas/submission';
import type { PasswordResetAnswer, RegisterAnswer, ResetRequestAnswer, SignOutEverywhereAnswer } from '@/lib/account/flows';
import type { UserAccessAnswer } from '@/lib/admin/users';
import type { ApiTokenRow, CreatedApiToken, RevokedApiToken } from '@/lib/account/api-tokens';
import type { SearchResult } from '@/lib/catalogue/search';
import type { OddsAnswer } from '@/lib/catalogue/odds';
import type { DeletedOptic, OpticView } from '@/lib/optics/store';
import type { ConeModelResult } from '@/lib/engine/types';
import type { NeffAnswer } from '@/lib/engine/neff';
import type { PreviewAnswer } from '@/lib/engine/preview';
import type { DecisionAnswer, NoteAnswer } from '@/moderation/decisions';
import type { SubmissionAnswer } from '@/moderation/submissions';

/** The error body of docs/api.md §Errors; a 503 also says after how many seconds to try again. */
export type ApiFailure = { error: string; details?: ErrorDetail[]; retryAfterSeconds?: number };
export type Outcome<T> = { ok: true; data: T } | { ok: false; status: number; failure: ApiFailure };

/** What a value becomes once it has been through JSON: dates arrive as ISO strings (a mapped type keeps arrays and tuples as they are). */
export type Json<T> = T extends Date ? string : T extends number ? number : T extends string | boolean | null | undefined ? T : T extends object ? { [K in keyof T]: Json<T[K]> } : T;

/** Status 0 stands for "no answer at all" (no network, server gone). */
export const NO_ANSWER = 0;

function failureOf(status: number, body: unknown, retryAfter: string | null): ApiFailure {
  const b = body as { error?: unknown; details?: unknown } | null;
  const failure: ApiFailure = { error: typeof b?.error === 'string' ? b.error : `The server answered ${status}.` };
  if (Array.isArray(b?.details)) failure.details = b.details as ErrorDetail[];
  // Retry-After is either seconds or an HTTP date (RFC 9110 §10.2.3); the server sends seconds.
  if (retryAfter !== null) {
    const seconds = /^\d+$/.test(retryAfter.trim()) ? Number(retryAfter) : Math.ceil((Date.parse(retryAfter) - Date.now()) / 1000);
    if (Number.isFinite(seconds)) failure.retryAfterSeconds = Math.max(0, seconds);
  }
  return failure;
}

/** One answer of the API, decoded: the body on success (typed as JSON carries it), the error body (or a sentence standing in for it) otherwise. */
export async function decodeResponse<T>(res: Response): Promise<Outcome<Json<T>>> {
  const body: unknown = await res.json().catch(() => null);
  if (res.ok) return { ok: true, data: body as Json<T> };
  return { ok: false, status: res.status, failure: failureOf(res.status, body, res.headers.get('retry-after')) };
}

const OFFLINE = 'Could not reach the server; check the connection and try again.';

/** Sends one request; a network failure becomes status 0 with `offline` as its sentence, an abort is thrown on. */
export async function request<T>(url: string, init: RequestInit = {}, offline = OFFLINE): Promise<Outcome<Json<T>>> {
  let res: Response;
  try {
    res = await fetch(url, init);
  } catch (err) {
    if ((err as Error)?.name === 'AbortError') throw err;
    return { ok: false, status: NO_ANSWER, failure: { error: offline } };
  }
  return decodeResponse<T>(res);
}

function json(method: string, body?: unknown, signal?: AbortSignal): RequestInit {
  return body === undefined ? { method, signal } : { method, signal, headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) };
}

/** A refusal thrown by `getJson`, for SWR and other code that prefers exceptions. */
export class ApiError extends Error {
  constructor(
    public status: number,
    public failure: ApiFailure,
  ) {
    super(failure.error);
  }
}

/** GET that throws `ApiError` on a refusal: the fetcher for SWR. */
export async function getJson<T>(url: string, signal?: AbortSignal): Promise<Json<T>> {
  const out = await request<T>(url, { headers: { accept: 'application/json' }, signal });
  if (!out.ok) throw new ApiError(out.status, out.failure);
  return out.data;
}

const id = (n: number | string) => encodeURIComponent(String(n));

export type ReaderOptions = z.input<typeof readerOptionsSchema>;
export type UserAccessChange = z.input<typeof roleChangeSchema>;
export type PreviewMetadata = z.input<typeof previewMetadataSchema>;

export const api = {
  account: {
    register: (input: z.input<typeof registerSchema>) => request<RegisterAnswer>('/api/account/register', json('POST', input)),
    requestReset: (input: z.input<typeof resetRequestSchema>) => request<ResetRequestAnswer>('/api/account/reset', json('POST', input)),
    confirmReset: (input: z.input<typeof resetConfirmSchema>) => request<PasswordResetAnswer>('/api/account/reset/confirm', json('POST', input)),
    signOutEverywhere: () => request<SignOutEverywhereAnswer>('/api/account/sessions', json('DELETE')),
  },
  admin: {
    changeUser: (userId: string, input: UserAccessChange) => request<UserAccessAnswer>(`/api/admin/users/${id(userId)}`, json('PATCH', input)),
  },
  tokens: {
    list: () => request<{ items: ApiTokenRow[] }>('/api/tokens'),
    create: (input: z.input<typeof createTokenSchema>) => request<CreatedApiToken>('/api/tokens', json('POST', input)),
    revoke: (tokenId: number) => request<RevokedApiToken>(`/api/tokens/${id(tokenId)}`, json('DELETE')),
  },
  curves: {
    /** GET /api/curves with the query string the catalogue's address carries. */
    searchUrl: (queryString: string) => `/api/curves?${queryString}`,
    search: (queryString: string, signal?: AbortSignal) => getJson<SearchResult>(`/api/curves?${queryString}`, signal),
    /** Reads a file on the server and stores nothing. */
    preview: (file: Blob, name: string, options: ReaderOptions = {}, metadata?: PreviewMetadata, signal?: AbortSignal) => {
      const form = new FormData();
      form.append('file', file, name);
      if (Object.keys(options).length > 0) form.append('options', JSON.stringify(options));
      if (metadata) form.append('metadata', JSON.stringify(metadata));
      return request<PreviewAnswer>('/api/curves/preview', { method: 'POST', body: form, signal }, 'The preview could not reach the server; check the connection.');
    },
  },
  labels: {
    odds: (url: string) => getJson<OddsAnswer>(url),
  },
  model: {
    cone: (input: z.input<typeof coneRequestSchema>, signal?: AbortSignal) => request<ConeModelResult>('/api/model/cone', json('POST', input, signal)),
    neff: (input: z.input<typeof neffRequestSchema>, signal?: AbortSignal) => request<NeffAnswer>('/api/model/neff', json('POST', input, signal), 'The fit could not reach the server.'),
  },
  optics: {
    listUrl: '/api/optics',
    list: () => getJson<{ items: OpticView[]; total: number }>('/api/optics'),
    create: (input: z.input<typeof opticInputSchema>) => request<OpticView>('/api/optics', json('POST', input)),
    update: (opticId: number, patch: z.input<typeof opticPatchSchema>) => request<OpticView>(`/api/optics/${id(opticId)}`, json('PATCH', patch)),
    remove: (opticId: number) => request<DeletedOptic>(`/api/optics/${id(opticId)}`, json('DELETE')),
  },
  submissions: {
    /** POST /api/submissions or /api/submissions/:id/revise with the metadata field alone (files go through the uploader). */
    send: (endpoint: string, form: FormData) => request<SubmissionAnswer>(endpoint, { method: 'POST', body: form }),
    decide: (submissionId: number, input: z.input<typeof reviewDecisionSchema>) => request<DecisionAnswer>(`/api/submissions/${id(submissionId)}/review`, json('POST', input)),
    addNote: (submissionId: number, input: z.input<typeof threadReplySchema>) => request<NoteAnswer>(`/api/submissions/${id(submissionId)}/notes`, json('POST', input)),
  },
};
