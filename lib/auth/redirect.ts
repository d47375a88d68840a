/**
 * Where next-auth may send someone after signing in or out: a path on this site
 * or an absolute address on this site's origin; anything else (another site, or
 * a callbackUrl that is not a URL at all, such as "http://[") goes to the home
 * page. next-auth's default calls `new URL()` unguarded, so a malformed
 * callbackUrl became a 500.
 */
export function safeRedirect({ url, baseUrl }: { url: string; baseUrl: string }): string {
  if (typeof url !== 'string' || url.length > 2048) return baseUrl;
  if (url.startsWith('/') && !url.startsWith('//') && !url.startsWith('/\\')) return `${baseUrl}${url}`;
  try {
    if (new URL(url).origin === new URL(baseUrl).origin) return url;
  } catch {
    // not a URL: fall through to the home page
  }
  return baseUrl;
}
