import Link from 'next/link';

type Query = Record<string, string | number | undefined>;

/** The page's own address with its filters and one change; empty values and page 1 drop out. */
export function hrefWith(path: string, query: Query, patch: Query = {}): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries({ ...query, ...patch })) {
    if (v === undefined || v === '' || (k === 'page' && Number(v) <= 1)) continue;
    params.set(k, String(v));
  }
  const s = params.toString();
  return s ? `${path}?${s}` : path;
}

/** "Page 2 of 5 · 230 events" with the way back and on, keeping the filters. */
export function Pager({ path, query, page, pages, total, noun }: { path: string; query: Query; page: number; pages: number; total: number; noun: [string, string] }) {
  const link = 'rounded-card border border-rule px-2 py-1 hover:border-accent';
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center gap-3 text-sm">
      <span data-testid="pager-total">
        Page <span className="figures">{Math.min(page, pages)}</span> of <span className="figures">{pages}</span> · <span className="figures">{total}</span>{` ${total === 1 ? noun[0] : noun[1]}`}
      </span>
      {page > 1 ? <Link href={hrefWith(path, query, { page: Math.min(page, pages) - 1 })} className={link} rel="prev">Previous page</Link> : null}
      {page < pages ? <Link href={hrefWith(path, query, { page: page + 1 })} className={link} rel="next">Next page</Link> : null}
    </nav>
  );
}

export const filterInput = 'w-full min-w-0 rounded-card border border-rule bg-panel px-2 py-1';

/** A labelled select of a filter form: "any …" first, then the labels of the stored values. */
export function FilterSelect({ name, label, value, any, options }: { name: string; label: string; value?: string; any: string; options: Partial<Record<string, string>> }) {
  return (
    <label className="space-y-1">
      <span className="block font-medium">{label}</span>
      <select name={name} defaultValue={value ?? ''} className={filterInput}>
        <option value="">{any}</option>
        {Object.entries(options).map(([k, v]) => <option key={k} value={k}>{v}</option>)}
      </select>
    </label>
  );
}
