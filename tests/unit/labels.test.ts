import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import {
  AUDIT_ACTION_LABELS, LABELS_BY_FIELD, STATUS_LABELS, ROLE_LABELS, REVIEW_KIND_LABELS, CHECK_LEVEL_LABELS, TARGET_TYPE_LABELS,
  formatCurveId, formatSubmissionId, parseCurveRef, parseSubmissionRef, labelOf, INSTRUMENT_LABELS,
} from '@/lib/labels';
import { SUBMISSION_STATUSES, CHECK_LEVELS } from '@/db/models/submission';
import { CURVE_STATUSES } from '@/db/models/curve';
import { ROLES } from '@/db/models/user';
import { REVIEW_KINDS } from '@/db/models/review';

const root = path.resolve(import.meta.dirname, '../..');

// Every enum reachable from a schema, with the name of the field that holds it (zod 4 definitions).
type Def = { type: string; [k: string]: unknown };
function enums(schema: unknown, field: string, out: { field: string; values: string[] }[], seen = new Set<unknown>()) {
  const def = (schema as { _zod?: { def?: Def } })?._zod?.def;
  if (!def || seen.has(schema)) return;
  seen.add(schema);
  if (def.type === 'enum') out.push({ field, values: Object.values(def.entries as Record<string, string>).map(String) });
  if (def.type === 'object') for (const [k, v] of Object.entries(def.shape as Record<string, unknown>)) enums(v, k, out, seen);
  for (const key of ['innerType', 'element', 'in', 'out', 'schema', 'valueType']) if (def[key]) enums(def[key], field, out, seen);
  if (Array.isArray(def.options)) for (const o of def.options) enums(o, field, out, seen);
}

describe('labels', () => {
  it('gives every enum value of every schema in lib/schemas a human label', async () => {
    const dir = path.join(root, 'lib/schemas');
    const found: { field: string; values: string[]; module: string }[] = [];
    for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts'))) {
      const mod = (await import(path.join(dir, file))) as Record<string, unknown>;
      for (const value of Object.values(mod)) {
        const out: { field: string; values: string[] }[] = [];
        enums(value, '', out);
        found.push(...out.map((o) => ({ ...o, module: file })));
      }
    }
    // the walk must reach the stored enums the issue names
    expect(found.some((f) => f.field === 'instrument' && f.values.includes('monochromator'))).toBe(true);
    expect(found.some((f) => f.field === 'polarization' && f.values.includes('unpolarized'))).toBe(true);
    const missing: string[] = [];
    for (const f of found) {
      const table = LABELS_BY_FIELD[f.field];
      if (!table) missing.push(`${f.module}: field "${f.field}" has no label table`);
      else for (const v of f.values) if (!table[v]) missing.push(`${f.module}: ${f.field} "${v}"`);
    }
    expect(missing).toEqual([]);
  });

  it('gives every value the models store a label', () => {
    for (const s of [...SUBMISSION_STATUSES, ...CURVE_STATUSES]) expect(STATUS_LABELS[s as keyof typeof STATUS_LABELS], s).toBeTruthy();
    for (const r of ROLES) expect(ROLE_LABELS[r], r).toBeTruthy();
    for (const k of REVIEW_KINDS) expect(REVIEW_KIND_LABELS[k], k).toBeTruthy();
    for (const l of CHECK_LEVELS) expect(CHECK_LEVEL_LABELS[l], l).toBeTruthy();
  });

  it('gives every audit action and target type written anywhere in the code a label', () => {
    const actions = new Set<string>();
    const targets = new Set<string>();
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const p = path.join(dir, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.tsx?$/.test(name)) {
          const text = readFileSync(p, 'utf8');
          for (const m of text.matchAll(/\baudit\([^,]+,\s*'([a-z_.]+)'/g)) actions.add(m[1]);
          for (const m of text.matchAll(/\baudit\([^,]+,\s*roleChanged \? '([a-z_.]+)' : '([a-z_.]+)'/g)) actions.add(m[1]).add(m[2]);
          for (const m of text.matchAll(/\baudit\([^,]+,\s*`submission\.\$\{decision\}`/g)) if (m) for (const d of ['verify', 'request_changes', 'reject']) actions.add(`submission.${d}`);
          for (const line of text.split('\n').filter((l) => l.includes('audit('))) for (const m of line.matchAll(/\{ type: '([a-z_]+)'/g)) targets.add(m[1]);
        }
      }
    };
    for (const d of ['lib', 'moderation', 'app']) walk(path.join(root, d));
    expect(actions.size).toBeGreaterThan(10);
    expect([...actions].filter((a) => !AUDIT_ACTION_LABELS[a])).toEqual([]);
    expect([...targets].filter((t) => !(t in TARGET_TYPE_LABELS))).toEqual([]);
  });

  it('falls back to the stored value with spaces for an unknown one, a dash for none', () => {
    expect(labelOf(INSTRUMENT_LABELS, 'monochromator')).toBe('Monochromator scan');
    expect(labelOf(INSTRUMENT_LABELS, 'some_new_kind')).toBe('some new kind');
    expect(labelOf(INSTRUMENT_LABELS, undefined)).toBe('—');
  });
});

describe('ids', () => {
  it('keeps curves and submissions in distinct spaces', () => {
    expect(formatCurveId(111)).toBe('C-111');
    expect(formatSubmissionId(87)).toBe('S-87');
  });

  it('reads the ways people type a curve id and refuses a submission id', () => {
    for (const t of ['C-111', 'c-111', 'C111', ' c111 ', '#111', '111']) expect(parseCurveRef(t), t).toBe(111);
    for (const t of ['S-111', 'C-', 'C-0', 'C-1.5', 'C--3', '0x10', '1e3', 'C-2147483648', 'curve', '']) expect(parseCurveRef(t), t).toBeNull();
    expect(parseSubmissionRef('S-87')).toBe(87);
    expect(parseSubmissionRef('s87')).toBe(87);
    expect(parseSubmissionRef('C-87')).toBeNull();
  });
});
