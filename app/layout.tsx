import type { Metadata, Viewport } from 'next';
import { headers } from 'next/headers';
import './globals.css';
import { textFont, figuresFont } from './fonts';
import { SiteHeader } from '@/components/shell/site-header';
import { SiteFooter } from '@/components/shell/site-footer';
import { NIGHT_VIEW_BOOT } from '@/components/shell/night-view';

export const metadata: Metadata = {
  title: { default: 'Bandcone — measured narrowband filter curves', template: '%s · Bandcone' },
  description: 'A checked library of measured narrowband filter curves, with the light-cone model for your optic.',
};

// Every page shows the visitor's sign-in state, so none can be prerendered.
export const dynamic = 'force-dynamic';

export const viewport: Viewport = { width: 'device-width', initialScale: 1 };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // proxy.ts sets the nonce the Content-Security-Policy allows for this request's scripts.
  const nonce = (await headers()).get('x-nonce') ?? undefined;
  return (
    <html lang="en" className={`${textFont.variable} ${figuresFont.variable}`} suppressHydrationWarning>
      <head>
        {/* Applied before first paint so the night view never flashes white. */}
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: NIGHT_VIEW_BOOT }} />
      </head>
      <body className="min-h-screen bg-paper font-sans text-ink antialiased flex flex-col">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 bg-panel px-3 py-2">
          Skip to content
        </a>
        <SiteHeader />
        <main id="main" className="mx-auto w-full max-w-page flex-1 px-4 py-6 sm:px-6">
          {children}
        </main>
        <SiteFooter />
      </body>
    </html>
  );
}
