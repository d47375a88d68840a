import 'server-only';
import { Op, type WhereOptions } from 'sequelize';
import { db } from '@/db/models';
import { forbidden } from '@/lib/http/errors';
import { hasRole, type Actor } from '@/lib/auth/actor';
import { isUuid } from '@/lib/http/ids';
import type { AuditQuery } from '@/lib/schemas/admin';
import {
  AUDIT_ACTION_LABELS, ROLE_LABELS, TARGET_TYPE_LABELS, formatCurveId, formatSubmissionId, labelOf, parseCurveRef, parseSubmissionRef,
} from '@/lib/labels';

export const AUDIT_PAGE_SIZE = 50;

export type AuditLink = { text: string; href: string | null };
export type AuditRowView = {
  id: number;
  at: string;
  actor: AuditLink & { filter: string };
  action: string;
  actionLabel: string;
  target: AuditLink | null;
  summary: string;
};
export type AuditView = {
  rows: AuditRowView[];
  total: number;
  page: number;
  pages: number;
  pageSize: number;
  actions: { value: string; label: string }[];
  /** What the filters could not use, said in a sentence beside them. */
  notes: string[];
};

const MAX_INT4 = 2_147_483_647;

/** `%` and `_` typed by the admin match themselves, not any text. */
export function likePattern(text: string): string {
  let out = '';
  for (const c of text) out += c === '%' || c === '_' || c === '\\' ? `\\${c}` : c;
  return `%${out}%`;
}

const str = (v: unknown) => (typeof v === 'string' ? v : '');
const num = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** One sentence a person reads instead of the stored JSON. */
export function summarise(action: string, detail: Record<string, unknown>): string {
  const d = detail ?? {};
  const curveIds = Array.isArray(d.curveIds) ? d.curveIds.filter((x): x is number => typeof x === 'number') : [];
  const files = Array.isArray(d.files) ? d.files.filter((x): x is string => typeof x === 'string') : [];
  const state = (v: unknown) => {
    const o = (v ?? {}) as { role?: string; disabled?: boolean };
    return `${labelOf(ROLE_LABELS, o.role)}${o.disabled ? ', disabled' : ', active'}`;
  };
  const sessions = num(d.sessionsEnded) ? `; ${plural(num(d.sessionsEnded)!, 'session')} ended` : '';
  switch (action) {
    case 'submission.created':
    case 'submission.revised':
      return [
        str(d.label) ? `“${str(d.label)}”` : '',
        d.revision ? `revision ${d.revision}` : '',
        files.length ? `${plural(files.length, 'file')} (${files.join(', ')})` : '',
        curveIds.length ? `curves ${curveIds.map(formatCurveId).join(', ')}` : '',
      ].filter(Boolean).join(' · ');
    case 'submission.verify':
    case 'submission.request_changes':
    case 'submission.reject':
      return [`revision ${num(d.revision) ?? '?'}`, str(d.note) ? `note: “${str(d.note).slice(0, 200)}”` : 'no note'].join(' · ');
    case 'submission.note':
      return d.kind === 'reply' ? 'the contributor answered' : 'a moderator wrote a note';
    case 'user.role_changed':
    case 'user.access_changed':
      return `${str(d.email)}: ${state(d.before)} → ${state(d.after)}${sessions}`;
    case 'user.registered':
    case 'user.signin_link_requested':
      return [str(d.email), d.sent === false ? 'no link sent (no usable account)' : ''].filter(Boolean).join(' · ');
    case 'user.email_confirmed':
      return d.via === 'signin_link' ? `by a sign-in link${d.passwordCleared ? '; the unconfirmed password was cleared' : ''}` : 'by the confirmation link';
    case 'user.password_reset':
      return `${plural(num(d.sessionsEnded) ?? 0, 'session')} ended, ${plural(num(d.tokensRevoked) ?? 0, 'API token')} revoked`;
    case 'user.signed_out_everywhere':
      return `${plural(num(d.sessionsEnded) ?? 0, 'session')} ended`;
    case 'token.created':
    case 'token.revoked':
      return str(d.name) ? `“${str(d.name)}”` : '';
    default:
      return Object.entries(d).map(([k, v]) => `${k}: ${typeof v === 'object' ? JSON.stringify(v) : String(v)}`).join(' · ').slice(0, 300);
  }
}

function targetLink(type: string | null, id: string | null, userEmails: Map<string, string>): AuditLink | null {
  if (!type) return null;
  const kind = labelOf(TARGET_TYPE_LABELS, type);
  if (id === null) return { text: kind, href: null };
  if (type === 'submission') return { text: `${kind} ${formatSubmissionId(id)}`, href: `/review/${encodeURIComponent(id)}` };
  if (type === 'curve') return { text: `${kind} ${formatCurveId(id)}`, href: `/curves/${encodeURIComponent(id)}` };
  if (type === 'user') {
    const email = userEmails.get(id);
    return { text: email ?? `${kind} ${id.slice(0, 8)}`, href: `/admin/users?q=${encodeURIComponent(email ?? id)}` };
  }
  return { text: `${kind} ${id}`, href: null };
}

/**
 * The filters: actor (part of a name or e-mail, "system" for rows no one signed), action
 * (exact, or a family such as "user."), target (S-87, C-111, a user's e-mail or id, with its
 * kind), and a date range in UTC days, both ends included. A curve id also finds the
 * submission rows that made the curve (their detail lists its id).
 */
export async function getAuditLog(viewer: Pick<Actor, 'role'>, query: AuditQuery): Promise<AuditView> {
  if (!hasRole(viewer, 'admin')) throw forbidden('Only admins read the audit log.');
  const { AuditEvent, User, sequelize } = db();
  const notes: string[] = [];
  const and: WhereOptions[] = [];

  if (query.actor) {
    if (query.actor.toLowerCase() === 'system') and.push({ actorId: null });
    else if (isUuid(query.actor)) and.push({ actorId: query.actor.toLowerCase() });
    else {
      const like = likePattern(query.actor);
      and.push(sequelize.literal(`"auditEvent"."actor_id" IN (SELECT id FROM users WHERE email ILIKE ${sequelize.escape(like)} OR name ILIKE ${sequelize.escape(like)})`) as unknown as WhereOptions);
    }
  }
  if (query.action) {
    if (query.action.endsWith('.')) and.push({ action: { [Op.startsWith]: query.action } });
    else and.push({ action: query.action });
  }
  if (query.target) {
    const t = query.target;
    const first = t.charAt(0).toUpperCase();
    const curve = query.targetType === 'curve' || (!query.targetType && first === 'C') ? parseCurveRef(t) : null;
    const submission = query.targetType === 'submission' || (!query.targetType && first === 'S') ? parseSubmissionRef(t) : null;
    if (curve !== null && curve <= MAX_INT4) {
      and.push({
        [Op.or]: [
          { targetType: 'curve', targetId: String(curve) },
          sequelize.literal(`"auditEvent"."detail" -> 'curveIds' @> ${sequelize.escape(JSON.stringify([curve]))}::jsonb`),
        ],
      } as WhereOptions);
    } else if (submission !== null) {
      and.push({ targetType: 'submission', targetId: String(submission) });
    } else if (isUuid(t)) {
      and.push({ targetType: query.targetType ?? 'user', targetId: t.toLowerCase() });
    } else if (t.includes('@')) {
      const user = await User.findOne({ where: { email: t.toLowerCase() }, attributes: ['id'] });
      if (user) and.push({ targetType: 'user', targetId: user.id });
      else {
        notes.push(`No account has the address ${t}.`);
        and.push({ id: null } as WhereOptions);
      }
    } else if (query.targetType && [...t].every((c) => c >= '0' && c <= '9') && t.length <= 10) {
      and.push({ targetType: query.targetType, targetId: t });
    } else {
      notes.push(`“${t}” is not a target: use S-87 for a submission, C-111 for a curve, or a user's e-mail.`);
    }
  } else if (query.targetType) {
    and.push({ targetType: query.targetType });
  }
  if (query.from) and.push({ createdAt: { [Op.gte]: new Date(`${query.from}T00:00:00Z`) } });
  if (query.to) and.push({ createdAt: { [Op.lt]: new Date(Date.parse(`${query.to}T00:00:00Z`) + 86_400_000) } });
  if (query.from && query.to && query.from > query.to) notes.push('The date range ends before it starts, so nothing falls inside it.');

  const page = query.page;
  const { rows, count } = await AuditEvent.findAndCountAll({
    where: and.length ? { [Op.and]: and } : {},
    order: [['createdAt', 'DESC'], ['id', 'DESC']],
    limit: AUDIT_PAGE_SIZE,
    offset: (page - 1) * AUDIT_PAGE_SIZE,
    include: [{ model: User, as: 'actor', attributes: ['id', 'email', 'name'] }],
  });

  const userTargets = [...new Set(rows.filter((r) => r.targetType === 'user' && r.targetId && isUuid(r.targetId)).map((r) => r.targetId!))];
  const emails = new Map<string, string>();
  if (userTargets.length) for (const u of await User.findAll({ where: { id: userTargets }, attributes: ['id', 'email'] })) emails.set(u.id, u.email);

  const used = (await AuditEvent.findAll({ attributes: [[sequelize.fn('DISTINCT', sequelize.col('action')), 'action']], raw: true })) as unknown as { action: string }[];
  const actions = [...new Set([...Object.keys(AUDIT_ACTION_LABELS), ...used.map((u) => u.action)])]
    .map((value) => ({ value, label: labelOf(AUDIT_ACTION_LABELS, value) }))
    .sort((a, b) => a.value.localeCompare(b.value));

  return {
    rows: rows.map((e) => {
      const who = (e as unknown as { actor?: { email: string; name: string | null } }).actor;
      return {
        id: Number(e.id),
        at: e.createdAt.toISOString(),
        actor: who
          ? { text: who.name ? `${who.name} (${who.email})` : who.email, href: `/admin/users?q=${encodeURIComponent(who.email)}`, filter: who.email }
          : { text: 'system', href: null, filter: 'system' },
        action: e.action,
        actionLabel: labelOf(AUDIT_ACTION_LABELS, e.action),
        target: targetLink(e.targetType, e.targetId, emails),
        summary: summarise(e.action, e.detail),
      };
    }),
    total: count,
    page,
    pages: Math.max(1, Math.ceil(count / AUDIT_PAGE_SIZE)),
    pageSize: AUDIT_PAGE_SIZE,
    actions,
    notes,
  };
}
