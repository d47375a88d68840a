import { SolarWords, WarningMark } from '@/components/catalogue/solar-caution';

/** The cautions docs/product.md §Cautions asks for beside model results. */
export function StudyCautions() {
  return (
    <aside aria-label="Cautions" className="rounded-card border border-rule bg-panel px-4 py-3 text-sm" data-testid="study-cautions">
      <h2 className="flex items-center gap-2 text-xs font-semibold uppercase tracking-wider text-muted">
        <WarningMark size={14} className="text-wait" />
        Before you rely on these numbers
      </h2>
      <ul className="mt-2 space-y-1.5 leading-snug">
        <li>
          <strong className="font-medium">Estimates.</strong> These results come from a first-order thin-film model (one effective index, a uniformly lit
          pupil). For purchases, instrument design or anything safety-relevant, rely on the maker&apos;s data and qualified advice.
        </li>
        <li>
          <SolarWords />
        </li>
      </ul>
    </aside>
  );
}
