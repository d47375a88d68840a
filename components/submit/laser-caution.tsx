/** docs/product.md §Cautions: the upload page reminds bench users of laser safety. */
export function LaserCaution() {
  return (
    <aside role="note" aria-label="Safety" className="flex gap-3 rounded-card border border-wait/60 bg-wait/10 p-3 text-sm">
      <svg width="20" height="20" viewBox="0 0 16 16" aria-hidden="true" className="mt-0.5 shrink-0 text-wait">
        <path d="M8 1.5 15 14H1z" fill="none" stroke="currentColor" strokeWidth="1.3" strokeLinejoin="round" />
        <circle cx="8" cy="10" r="1.6" fill="currentColor" />
        <path d="M8 10 11.5 6.5" stroke="currentColor" strokeWidth="1.1" />
      </svg>
      <p>
        <span className="font-medium">Bench safety.</span> Lasers and bright lamps used on test benches can harm eyes. Follow your lab&apos;s laser-safety rules
        (IEC 60825-1 classes) while measuring.
      </p>
    </aside>
  );
}
