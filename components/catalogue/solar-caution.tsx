/** The warning triangle of every caution. */
export function WarningMark({ size, className }: { size: number; className: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 16 16" aria-hidden="true" className={className}>
      <path d="M8 1.5 15 14H1z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
      <path d="M8 6v4M8 11.6v.4" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
    </svg>
  );
}

/** The solar caution's words, one wording wherever it appears. */
export function SolarWords() {
  return (
    <>
      <strong className="font-medium">Not a solar filter.</strong> Night-sky narrowband filters, Hα included, must never be used to look at or image the
      Sun. Solar work needs purpose-built full-aperture solar filters (for direct viewing, ISO 12312-2).
    </>
  );
}

/** docs/product.md §Cautions: near any solar-looking use, Hα especially. */
export function SolarCaution({ compact = false }: { compact?: boolean }) {
  return (
    <aside role="note" aria-label="Solar caution" className={`flex gap-2 rounded-card border border-wait/50 bg-wait/10 px-3 py-2 ${compact ? 'text-xs' : 'text-sm'}`} data-testid="solar-caution">
      <WarningMark size={16} className="mt-0.5 shrink-0 text-wait" />
      <p>
        <SolarWords />
      </p>
    </aside>
  );
}

/** docs/product.md §Cautions: model results are estimates. */
export function ModelCaution() {
  return (
    <p className="text-xs text-muted" role="note">
      Throughputs are estimates from a first-order thin-film model; for purchases, instrument design or safety-relevant decisions, rely on the
      maker&apos;s data and qualified advice.
    </p>
  );
}
