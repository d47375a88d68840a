/** Signs in through next-auth's credentials flow as a browser would; the session cookie, or null when refused. */
export async function signIn(url: string, email: string, password: string): Promise<string | null> {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair.indexOf('=');
      jar.set(pair.slice(0, eq).trim(), pair.slice(eq + 1));
    }
  };
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const csrf = await fetch(`${url}/api/auth/csrf`);
  keep(csrf);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${url}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: cookie(), origin: new URL(url).origin },
    body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
  });
  keep(res);
  const session = (await (await fetch(`${url}/api/auth/session`, { headers: { cookie: cookie() } })).json()) as { user?: unknown };
  return session?.user ? cookie() : null;
}
