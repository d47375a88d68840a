/**
 * The site's own address, read in one place. NEXTAUTH_URL is the public URL
 * the deployment declares (next-auth reads the same variable); links in mail
 * are built from it, citations and downloads point at its origin, and the
 * request guard lets writes come from it. Without it, mail links point at the
 * local server and citations at whatever address the request came to.
 */

const LOCAL_SITE = 'http://127.0.0.1:3000';

/** The configured public URL, as written, or undefined. */
export function configuredSiteUrl(): string | undefined {
  return process.env.NEXTAUTH_URL || undefined;
}

/** The base of every link in mail: the configured public URL, else the local server. */
export function siteUrl(): string {
  return process.env.NEXTAUTH_URL ?? LOCAL_SITE;
}

/** Where citations point: the configured public address's origin, else the address the request came to. */
export function publicOrigin(fallback: string): string {
  const configured = configuredSiteUrl();
  try {
    return configured ? new URL(configured).origin : fallback;
  } catch {
    return fallback;
  }
}
