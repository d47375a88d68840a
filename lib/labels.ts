/**
 * The words the interface and the mail use for what the database stores, in one place.
 *
 * Ids: a submission and the curves it holds are numbered separately, so "87" alone could be
 * either. Every id a person sees carries its kind, S-87 for a submission and C-111 for a
 * curve (formatSubmissionId / formatCurveId), and wherever a person types an id, "C-111",
 * "c111", "#111" and "111" all mean curve 111 (parseCurveRef).
 *
 * Stored values: every enum value a schema accepts or a model stores has a human label
 * here; tests/unit/labels.test.ts walks the schemas and models and fails on any without one.
 */

import { COATINGS, COATING_NAMES } from '@/lib/engine/temperature';
import { LINES } from '@/lib/engine/lines';
import { INSTRUMENTS } from '@/lib/engine/limits';

export { INSTRUMENTS };

export const CURVE_ID_PREFIX = 'C-';
export const SUBMISSION_ID_PREFIX = 'S-';

export function formatCurveId(id: number | string): string {
  return `${CURVE_ID_PREFIX}${id}`;
}

export function formatSubmissionId(id: number | string): string {
  return `${SUBMISSION_ID_PREFIX}${id}`;
}

const MAX_INT4 = 2_147_483_647;

function digitsToId(text: string): number | null {
  if (text.length < 1 || text.length > 10) return null;
  for (const c of text) if (c < '0' || c > '9') return null;
  const n = Number(text);
  return n >= 1 && n <= MAX_INT4 ? n : null;
}

/**
 * A typed id of one kind: the kind's letter (either case) with or without a dash, a "#", or
 * bare digits; the other kind's letter is refused, so S-87 never opens curve 87. Read
 * character by character, no regular expression on user text.
 */
function parseRef(raw: string, letter: 'C' | 'S'): number | null {
  let t = raw.trim();
  const first = t.charAt(0).toUpperCase();
  if (first === letter) {
    t = t.slice(1);
    if (t.startsWith('-')) t = t.slice(1);
  } else if (first === '#') {
    t = t.slice(1);
  }
  return digitsToId(t.trim());
}

/** "C-111", "c111", "#111" or "111" → 111; anything else (including "S-111") → null. */
export function parseCurveRef(raw: string): number | null {
  return parseRef(raw, 'C');
}

/** "S-87", "s87", "#87" or "87" → 87; anything else (including "C-87") → null. */
export function parseSubmissionRef(raw: string): number | null {
  return parseRef(raw, 'S');
}

// ——— stored values ———

/** A label for each value of T, and indexable by any stored string (which may have none). */
export type Labels<T extends string> = Record<T, string> & Partial<Record<string, string>>;

export const BEAMS = ['collimated', 'converging'] as const;
export const POLARIZATIONS = ['unpolarized', 's', 'p'] as const;
export const LICENCES = ['CC-BY-4.0', 'CC0-1.0'] as const;
export const DECISIONS = ['verify', 'request_changes', 'reject'] as const;
export const REVIEW_KINDS = [...DECISIONS, 'note', 'reply'] as const;

export const INSTRUMENT_LABELS: Labels<(typeof INSTRUMENTS)[number]> = {
  spectrophotometer: 'Spectrophotometer',
  spectrograph: 'Grating spectrograph',
  monochromator: 'Monochromator scan',
  other: 'Other instrument',
};

export const BEAM_LABELS: Labels<(typeof BEAMS)[number]> = {
  collimated: 'Collimated',
  converging: 'Converging',
};

export const POLARIZATION_LABELS: Labels<(typeof POLARIZATIONS)[number]> = {
  unpolarized: 'Unpolarised (natural light)',
  s: 's-polarised (TE)',
  p: 'p-polarised (TM)',
};

export const COATING_LABELS: Labels<(typeof COATINGS)[number]> = {
  hard: `Hard: ${COATING_NAMES.hard.replace('hard ', '')}`,
  soft: `Soft: ${COATING_NAMES.soft.replace('soft ', '')}`,
  unknown: 'Coating not known',
};

export const LICENCE_LABELS: Labels<(typeof LICENCES)[number]> = {
  'CC-BY-4.0': 'CC BY 4.0 (credit the contributor)',
  'CC0-1.0': 'CC0 1.0 (public domain)',
};

/** The short licence names printed beside a curve and in citations. */
export const LICENCE_SHORT: Labels<(typeof LICENCES)[number]> = {
  'CC-BY-4.0': 'CC BY 4.0',
  'CC0-1.0': 'CC0 1.0',
};

export const DECISION_LABELS: Labels<(typeof DECISIONS)[number]> = {
  verify: 'Verify and publish',
  request_changes: 'Ask for changes',
  reject: 'Reject',
};

/** What a decision did, as a sentence's verb ("was verified and published"). */
export const DECISION_PAST: Labels<(typeof DECISIONS)[number]> = {
  verify: 'verified and published',
  request_changes: 'returned with a request for changes',
  reject: 'rejected',
};

export const REVIEW_KIND_LABELS: Labels<(typeof REVIEW_KINDS)[number]> = {
  verify: 'Verified',
  request_changes: 'Changes requested',
  reject: 'Rejected',
  note: 'Moderators’ note',
  reply: 'Reply',
};

export const STATUS_LABELS: Labels<'submitted' | 'changes_requested' | 'verified' | 'rejected' | 'superseded'> = {
  submitted: 'Waiting for review',
  changes_requested: 'Changes requested',
  verified: 'Verified',
  rejected: 'Rejected',
  superseded: 'Superseded by a newer revision',
};

export const ROLE_LABELS: Labels<'contributor' | 'moderator' | 'admin'> = {
  contributor: 'Contributor',
  moderator: 'Moderator',
  admin: 'Administrator',
};

/** An account's state on the admin users page (users.disabled_at set or not). */
export const ACCESS_LABELS: Labels<'active' | 'disabled'> = {
  active: 'Active',
  disabled: 'Disabled',
};

export const CHECK_LEVEL_LABELS: Labels<'info' | 'warn' | 'error'> = {
  info: 'Note',
  warn: 'Warning',
  error: 'Problem',
};

export const LINE_LABELS: Record<string, string> = Object.fromEntries(LINES.map((l) => [l.id, `${l.name} ${l.airNm.toFixed(1)} nm`]));

// The reader options of the upload page and the model routes.
export const WAVELENGTH_UNIT_LABELS: Labels<'nm' | 'angstrom' | 'um'> = { nm: 'nanometres (nm)', angstrom: 'ångström (Å)', um: 'micrometres (µm)' };
export const TRANSMISSION_UNIT_LABELS: Labels<'fraction' | 'percent' | 'od'> = { fraction: 'fraction (0–1)', percent: 'percent (0–100)', od: 'optical density (OD)' };
export const DELIMITER_LABELS: Labels<',' | ';' | '\t' | 'whitespace'> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', whitespace: 'spaces' };
export const DECIMAL_SEPARATOR_LABELS: Labels<'.' | ','> = { '.': 'point (1.5)', ',': 'comma (1,5)' };
export const MAPPING_LABELS: Labels<'tangent' | 'sine'> = { tangent: 'tangent (rectilinear lens)', sine: 'sine (aplanatic)' };

/** The target types of the audit trail. */
export const TARGET_TYPE_LABELS: Labels<'submission' | 'curve' | 'user' | 'api_token'> = {
  submission: 'Submission',
  curve: 'Curve',
  user: 'User',
  api_token: 'API token',
};

/** Every action lib/audit.ts records; the admin audit page filters by these. */
export const AUDIT_ACTION_LABELS: Record<string, string> = {
  'user.registered': 'Registered',
  'user.register_existing': 'Tried to register an existing address',
  'user.email_confirmed': 'Confirmed their e-mail',
  'user.password_reset': 'Reset their password',
  'user.signed_out_everywhere': 'Signed out everywhere',
  'user.signin_link_requested': 'Asked for a sign-in link',
  'user.signed_in_by_link': 'Signed in by link',
  'user.role_changed': 'Role changed',
  'user.access_changed': 'Access changed',
  'token.created': 'API token created',
  'token.revoked': 'API token revoked',
  'submission.created': 'Submission sent',
  'submission.revised': 'Submission revised',
  'submission.verify': 'Submission verified and published',
  'submission.request_changes': 'Changes requested',
  'submission.reject': 'Submission rejected',
  'submission.note': 'Note on a submission',
};

/**
 * Which label table covers the enum a schema field or model column holds, by the field's
 * name. The labels test walks every schema and fails on an enum field missing here.
 */
export const LABELS_BY_FIELD: Record<string, Partial<Record<string, string>>> = {
  instrument: INSTRUMENT_LABELS,
  beam: BEAM_LABELS,
  polarization: POLARIZATION_LABELS,
  coating: COATING_LABELS,
  licence: LICENCE_LABELS,
  decision: DECISION_LABELS,
  kind: REVIEW_KIND_LABELS,
  status: STATUS_LABELS,
  role: ROLE_LABELS,
  access: ACCESS_LABELS,
  level: CHECK_LEVEL_LABELS,
  checkLevel: CHECK_LEVEL_LABELS,
  lines: LINE_LABELS,
  wavelengthUnit: WAVELENGTH_UNIT_LABELS,
  transmissionUnit: TRANSMISSION_UNIT_LABELS,
  delimiter: DELIMITER_LABELS,
  decimalSeparator: DECIMAL_SEPARATOR_LABELS,
  mapping: MAPPING_LABELS,
  targetType: TARGET_TYPE_LABELS,
  action: AUDIT_ACTION_LABELS,
};

/** The label of a stored value, or the value itself with its underscores as spaces when it has none. */
export function labelOf(table: Partial<Record<string, string>>, value: string | null | undefined, missing = '—'): string {
  if (value === null || value === undefined || value === '') return missing;
  return table[value] ?? value.replace(/_/g, ' ');
}
