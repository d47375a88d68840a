/**
 * "Cite this": one curve revision as BibTeX and as CSL-JSON (the Citation Style
 * Language's data format, read by Zotero, Pandoc and citeproc processors).
 * A citation always names the revision and its permanent address, since a later
 * revision is a new curve with its own id and the cited numbers never change
 * (docs/citing.md).
 */

import { LICENCE_URLS, issuedDate, type CurveRecord } from './record';

export const CITE_FORMATS = ['bibtex', 'csl'] as const;
export type CiteFormat = (typeof CITE_FORMATS)[number];

const PUBLISHER = 'Bandcone';

function titleOf(r: CurveRecord): string {
  const unit = r.serial ? `, unit ${r.serial}` : '';
  return `${r.label}${unit}: measured transmission curve, revision ${r.revision}`;
}

function noteOf(r: CurveRecord): string {
  const parts = [`Bandcone curve ${r.id}, revision ${r.revision}`];
  if (r.status !== 'verified') parts.push(r.status === 'superseded' ? 'superseded by a later revision' : `${r.status}, not yet verified by a moderator`);
  if (r.lab) parts.push(`measured at ${r.lab}`);
  if (r.measuredOn) parts.push(`measured on ${r.measuredOn}`);
  parts.push(`licence ${r.licence}`);
  return parts.join('; ');
}

const BIBTEX_SPECIAL: Record<string, string> = {
  '\\': '\\textbackslash{}',
  '{': '\\{',
  '}': '\\}',
  '%': '\\%',
  '&': '\\&',
  $: '\\$',
  '#': '\\#',
  _: '\\_',
  '^': '\\^{}',
  '~': '\\~{}',
};

/** Text safe inside a braced BibTeX field: LaTeX specials escaped, line breaks flattened. */
export function bibtexText(s: string): string {
  let out = '';
  for (const ch of s) {
    if (ch === '\n' || ch === '\r' || ch === '\t') out += ' ';
    else out += BIBTEX_SPECIAL[ch] ?? ch;
  }
  return out;
}

export function toBibtex(r: CurveRecord): string {
  const date = issuedDate(r);
  const author = r.contributor ? `{${bibtexText(r.contributor)}}` : '{Anonymous contributor}';
  const fields: [string, string][] = [
    // a name kept in double braces is cited as written, never split into first and last names
    ['author', author],
    ['title', `{${bibtexText(titleOf(r))}}`],
    ['howpublished', `\\url{${r.url}}`],
    ['publisher', PUBLISHER],
    ['year', date.slice(0, 4)],
    ['month', String(Number(date.slice(5, 7)))],
    ['date', date],
    ['version', String(r.revision)],
    ['url', r.url],
    ['note', bibtexText(noteOf(r))],
  ];
  if (r.lab) fields.push(['organization', bibtexText(r.lab)]);
  const body = fields.map(([k, v]) => `  ${k} = {${v}}`).join(',\n');
  return `@misc{bandcone-curve-${r.id}-r${r.revision},\n${body}\n}\n`;
}

/** CSL-JSON: an array of one item of type "dataset" (CSL 1.0.2 data schema). */
export function toCsl(r: CurveRecord): object[] {
  const date = issuedDate(r);
  const parts = date.split('-').map(Number);
  const item: Record<string, unknown> = {
    id: `bandcone-curve-${r.id}-r${r.revision}`,
    type: 'dataset',
    title: titleOf(r),
    author: [{ literal: r.contributor ?? 'Anonymous contributor' }],
    issued: { 'date-parts': [parts] },
    publisher: PUBLISHER,
    version: String(r.revision),
    URL: r.url,
    genre: 'measured transmission curve',
    medium: 'digital data',
    note: noteOf(r),
  };
  // the data schema has no licence or lab variable and refuses unknown keys; "custom" is its place for them
  item.custom = { curveId: r.id, revision: r.revision, status: r.status, licence: r.licence, licenceUrl: LICENCE_URLS[r.licence] ?? null, lab: r.lab, measuredOn: r.measuredOn };
  return [item];
}
