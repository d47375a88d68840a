export function SiteFooter() {
  return (
    <footer className="border-t border-rule text-sm text-muted">
      <div className="mx-auto max-w-page space-y-1 px-4 py-4 sm:px-6">
        <p>
          Verified curves are published under CC BY 4.0 unless the contributor chose CC0 1.0; cite the curve page when you use the data.
        </p>
        <p>
          Model results are first-order estimates. Night-sky narrowband filters are not solar filters: never aim them at the Sun.
        </p>
      </div>
    </footer>
  );
}
