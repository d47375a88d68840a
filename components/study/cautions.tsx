/** The cautions PRODUCT.md asks for beside model results. */
export function StudyCautions() {
  return (
    <aside aria-label="Cautions" className="rounded-card border border-rule bg-panel px-4 py-3 text-sm" data-testid="study-cautions">
      <h2 className="flex items-center gap-2 text-xs font-semibold uppercase tracking-wider text-muted">
        <svg width="14" height="14" viewBox="0 0 16 16" aria-hidden="true" className="text-wait">
          <path d="M8 1.5 15 14H1z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
          <path d="M8 6v4M8 11.6v.4" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
        </svg>
        Before you rely on these numbers
      </h2>
      <ul className="mt-2 space-y-1.5 leading-snug">
        <li>
          <strong className="font-medium">Estimates.</strong> These results come from a first-order thin-film model (one effective index, a uniformly lit
          pupil). For purchases, instrument design or anything safety-relevant, rely on the maker&apos;s data and qualified advice.
        </li>
        <li>
            <strong className="font-medium">Not a solar filter.</strong> Night-sky narrowband filters, Hα included, must never be used to look at or image the
            Sun. Solar work needs purpose-built full-aperture solar filters (for direct viewing, ISO 12312-2).
        </li>
      </ul>
    </aside>
  );
}
