'use client';

// Shown when a page cannot be drawn: most often the database is restarting, so the words say that first.
export default function PageError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="mx-auto max-w-md space-y-3" role="alert">
      <h1 className="text-2xl font-semibold">The library is briefly unavailable</h1>
      <p>This page could not be drawn just now, usually because the database is restarting. Nothing you saved is lost.</p>
      <button type="button" onClick={reset} className="rounded-card border border-rule bg-panel px-3 py-1.5">
        Try again
      </button>
    </div>
  );
}
