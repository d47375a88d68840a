// Talks to the running test server exactly as outside scripts do (docs/api.md).
export const BASE = process.env.TEST_BASE_URL ?? 'http://127.0.0.1:3100';
export const ORIGIN = new URL(BASE).origin;
export const DEMO_PASSWORD = process.env.DEMO_PASSWORD ?? 'bandcone-demo';

export type Client = { cookie: string; fetch: (path: string, init?: RequestInit) => Promise<Response> };

function mergeCookies(jar: Map<string, string>, res: Response) {
  for (const line of res.headers.getSetCookie()) {
    const [pair] = line.split(';');
    const eq = pair.indexOf('=');
    jar.set(pair.slice(0, eq).trim(), pair.slice(eq + 1));
  }
}

function clientFor(jar: Map<string, string>): Client {
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  return {
    get cookie() {
      return cookie();
    },
    fetch: async (path, init = {}) => {
      const headers = new Headers(init.headers);
      if (jar.size) headers.set('cookie', cookie());
      // As a browser on our own pages would: writes that ride on the cookie must name their origin.
      if (!headers.has('origin')) headers.set('origin', ORIGIN);
      const res = await fetch(BASE + path, { ...init, headers, redirect: 'manual' });
      mergeCookies(jar, res);
      return res;
    },
  };
}

export const anonymous = (): Client => clientFor(new Map());

/** The standard next-auth credentials flow: CSRF token, then the callback. Null when refused. */
export async function trySignIn(email: string, password = DEMO_PASSWORD): Promise<Client | null> {
  const jar = new Map<string, string>();
  const client = clientFor(jar);
  const csrf = await client.fetch('/api/auth/csrf');
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await client.fetch('/api/auth/callback/credentials', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
  });
  if (![200, 302, 401].includes(res.status)) throw new Error(`sign-in answered ${res.status}`);
  const session = await (await client.fetch('/api/auth/session')).json();
  return session?.user ? client : null;
}

export async function signIn(email: string, password = DEMO_PASSWORD): Promise<Client> {
  const client = await trySignIn(email, password);
  if (!client) throw new Error(`sign-in as ${email} did not give a session`);
  return client;
}

export async function json<T = any>(res: Response): Promise<T> { // eslint-disable-line @typescript-eslint/no-explicit-any
  return (await res.json()) as T;
}
