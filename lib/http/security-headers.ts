// The security headers of every answer, in one place: next.config.ts sends the static ones,
// proxy.ts the per-request Content-Security-Policy of pages.
import { bucketOrigin } from '../storage/config';

/**
 * Scripts run only when they carry this request's nonce (Next adds it to its own scripts and
 * the root layout to its inline one); 'strict-dynamic' lets those load the chunks they need.
 * Workers (the cone study) and blobs (chart downloads) come from our origin; the uploader PUTs
 * files to the file store's origin (presigned URLs, lib/storage/uploads.ts). Styles may be
 * inline: React and ECharts set style attributes. Nothing may frame us, nothing is a plugin,
 * and forms post only to us (common practice: the OWASP CSP cheat sheet's strict policy).
 */
export function pageCsp(nonce: string, dev = process.env.NODE_ENV === 'development', store = bucketOrigin()): string {
  return [
    `default-src 'self'`,
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? ` 'unsafe-eval'` : ''}`,
    `style-src 'self' 'unsafe-inline'`,
    `img-src 'self' data: blob:`,
    `font-src 'self' data:`,
    `connect-src 'self' ${store}${dev ? ' ws: wss:' : ''}`,
    `worker-src 'self' blob:`,
    `object-src 'none'`,
    `base-uri 'self'`,
    `form-action 'self'`,
    `frame-ancestors 'none'`,
  ].join('; ');
}

/** API answers are data, never documents: they may load nothing and be framed by no one. */
export const API_CSP = `default-src 'none'; frame-ancestors 'none'`;

export function staticSecurityHeaders(production = process.env.NODE_ENV === 'production'): { key: string; value: string }[] {
  return [
    { key: 'X-Content-Type-Options', value: 'nosniff' },
    { key: 'Referrer-Policy', value: 'same-origin' },
    // For browsers that predate frame-ancestors.
    { key: 'X-Frame-Options', value: 'DENY' },
    { key: 'Permissions-Policy', value: 'camera=(), microphone=(), geolocation=(), payment=()' },
    { key: 'Cross-Origin-Opener-Policy', value: 'same-origin' },
    // Only over HTTPS does a browser heed it; two years, as the HSTS preload list asks (common practice).
    ...(production ? [{ key: 'Strict-Transport-Security', value: 'max-age=63072000; includeSubDomains' }] : []),
  ];
}
