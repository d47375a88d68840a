'use client';

// The whole frame failed (the header reads the session too): a plain page with no styles of ours to depend on.
export default function GlobalError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body style={{ fontFamily: 'system-ui, sans-serif', maxWidth: '32rem', margin: '3rem auto', padding: '0 1rem' }}>
        <h1>The library is briefly unavailable</h1>
        <p>Bandcone could not draw this page just now, usually because its database is restarting. Nothing you saved is lost.</p>
        <button type="button" onClick={reset}>Try again</button>
      </body>
    </html>
  );
}
