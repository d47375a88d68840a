// Posts JSON and turns an error body (docs/api.md §Errors) into a message and per-field errors.
export type ApiFailure = { error: string; details?: { field?: string; line?: number; message: string }[] };

export async function postJson<T>(url: string, body: unknown, method = 'POST'): Promise<{ ok: true; data: T } | { ok: false; status: number; failure: ApiFailure }> {
  const res = body === undefined ? await fetch(url, { method }) : await fetch(url, { method, headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  const data = await res.json().catch(() => ({ error: `The server answered ${res.status}.` }));
  if (!res.ok) return { ok: false, status: res.status, failure: data as ApiFailure };
  return { ok: true, data: data as T };
}
