import type { QualityItem } from '@/lib/engine/quality';
import { CheckList, type CheckItem } from './check-list';

const LEVEL: Record<QualityItem['level'], CheckItem['level']> = { pass: 'info', warn: 'warn', fail: 'error' };

/** The measurement-quality items in the check list's words and marks (pass = ok, warn = warning, fail = problem). */
export function QualityList({ items, file }: { items: QualityItem[]; file?: string }) {
  const checks: CheckItem[] = items.map((i) => ({ code: `quality-${i.code}`, level: LEVEL[i.level], message: i.message, file }));
  return <CheckList checks={checks} caption="Measurement quality" />;
}
