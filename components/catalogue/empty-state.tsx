'use client';

import type { Query, SearchResponse } from './types';

type Patch = Record<string, string | undefined>;

/** A relaxation's change to the address: null removes the parameter. */
function patchOf(params: Record<string, string | null>): Patch {
  return Object.fromEntries(Object.entries(params).map(([k, v]) => [k, v ?? undefined]));
}

const pct = (v: number) => `${Number((v * 100).toPrecision(3))} %`;

/**
 * What an empty search is nearest to, as the server counted it (GET /api/curves `nearest`): the best
 * line throughput on the optic, and each relaxation with the number of units (one row per physical unit) it would find.
 */
export function EmptyState(props: { query: Query; data: SearchResponse | undefined; onChange: (p: Patch) => void; hrefFor: (p: Patch) => string }) {
  const nearest = props.data?.nearest;
  const found = nearest?.relaxations.filter((r) => r.total > 0) ?? [];
  const none = nearest?.relaxations.filter((r) => r.total === 0) ?? [];
  const anyFilter = Object.keys(props.query).some((k) => !['page', 'pageSize', 'sort', 'dir', 'sky'].includes(k));
  return (
    <div className="rounded-card border border-dashed border-rule bg-panel px-5 py-6" data-testid="empty-state">
      <h2 className="font-medium">No curve matches every filter.</h2>
      {nearest?.bestThroughput !== undefined ? (
        <p className="mt-1 text-sm" data-testid="best-throughput">
          On this optic the best curve of the search keeps <strong className="figures">{pct(nearest.bestThroughput)}</strong> of the line.
        </p>
      ) : null}
      {found.length ? (
        <>
          <p className="mt-1 text-sm text-muted">The nearest answers:</p>
          <ul className="mt-3 space-y-1.5 text-sm" data-testid="relaxations">
            {found.map((r) => (
              <li key={r.label}>
                <a
                  href={props.hrefFor(patchOf(r.params))}
                  onClick={(e) => {
                    e.preventDefault();
                    props.onChange(patchOf(r.params));
                  }}
                  className="text-accent underline-offset-4 hover:underline"
                >
                  {r.label}
                </a>
                <span className="figures ml-2 text-xs text-muted" data-testid="relaxation-total">
                  {r.total.toLocaleString('en-US')} unit{r.total === 1 ? '' : 's'}
                </span>
              </li>
            ))}
          </ul>
        </>
      ) : null}
      {none.length ? (
        <p className="mt-3 text-xs text-muted">
          Would still find nothing: {none.map((r) => r.label).join('; ')}.
        </p>
      ) : null}
      {!anyFilter ? <p className="mt-1 text-sm text-muted">The catalogue holds no verified curves yet.</p> : null}
    </div>
  );
}
