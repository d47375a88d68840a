import type { Actor } from '@/lib/auth/actor';
import type { StatusFilter } from '@/lib/auth/policy';

// Who may see what, written out row by row from docs/product.md ("Roles") and
// docs/api.md (GET /api/curves, status): the expectation that the policy
// (lib/auth/policy.ts) is checked against, by predicate (tests/unit/auth) and in
// PostgreSQL (tests/integration/policy.test.ts).

export const ME = '00000000-0000-4000-8000-00000000000a';
export const OTHER = '00000000-0000-4000-8000-00000000000b';

export type Fixture = { name: string; status: string; mine: boolean; everVerified: boolean };

export const CURVES: Fixture[] = [
  { name: 'verified', status: 'verified', mine: false, everVerified: true },
  { name: 'superseded-once-verified', status: 'superseded', mine: false, everVerified: true },
  { name: 'superseded-never-verified', status: 'superseded', mine: false, everVerified: false },
  { name: 'submitted', status: 'submitted', mine: false, everVerified: false },
  { name: 'changes', status: 'changes_requested', mine: false, everVerified: false },
  { name: 'rejected', status: 'rejected', mine: false, everVerified: false },
  { name: 'mine-verified', status: 'verified', mine: true, everVerified: true },
  { name: 'mine-superseded-once-verified', status: 'superseded', mine: true, everVerified: true },
  { name: 'mine-superseded-never-verified', status: 'superseded', mine: true, everVerified: false },
  { name: 'mine-submitted', status: 'submitted', mine: true, everVerified: false },
  { name: 'mine-changes', status: 'changes_requested', mine: true, everVerified: false },
  { name: 'mine-rejected', status: 'rejected', mine: true, everVerified: false },
];

const actor = (role: Actor['role'] | null): Actor | null => (role ? { id: ME, email: `${role}@example.test`, name: role, role, via: 'session' } : null);
export const ROLES = { visitor: actor(null), contributor: actor('contributor'), moderator: actor('moderator'), admin: actor('admin') };
export type RoleName = keyof typeof ROLES;

const ALL = CURVES.map((c) => c.name);
const except = (...names: string[]) => ALL.filter((n) => !names.includes(n));
const PUBLIC_READ = ['verified', 'superseded-once-verified', 'mine-verified', 'mine-superseded-once-verified'];

/** READ: the curve page, points, downloads, compare and study. */
export const READ: Record<RoleName, string[]> = {
  visitor: PUBLIC_READ,
  contributor: [...PUBLIC_READ, 'mine-superseded-never-verified', 'mine-submitted', 'mine-changes', 'mine-rejected'],
  moderator: ALL,
  admin: ALL,
};

const NO_SUPERSEDED = except('superseded-once-verified', 'superseded-never-verified', 'mine-superseded-once-verified', 'mine-superseded-never-verified');
const VERIFIED = ['verified', 'mine-verified'];
const MINE = ALL.filter((n) => n.startsWith('mine-'));

/** SEARCH: the catalogue for each status filter; 403 where a visitor asks for a status. */
export const SEARCH: Record<string, Record<RoleName, string[] | 403>> = {
  '(none)': { visitor: VERIFIED, contributor: ['verified', 'mine-verified', 'mine-submitted', 'mine-changes', 'mine-rejected'], moderator: NO_SUPERSEDED, admin: NO_SUPERSEDED },
  verified: { visitor: VERIFIED, contributor: VERIFIED, moderator: VERIFIED, admin: VERIFIED },
  any: { visitor: 403, contributor: ['verified', ...MINE], moderator: ALL, admin: ALL },
  submitted: { visitor: 403, contributor: ['mine-submitted'], moderator: ['submitted', 'mine-submitted'], admin: ['submitted', 'mine-submitted'] },
  changes_requested: { visitor: 403, contributor: ['mine-changes'], moderator: ['changes', 'mine-changes'], admin: ['changes', 'mine-changes'] },
  rejected: { visitor: 403, contributor: ['mine-rejected'], moderator: ['rejected', 'mine-rejected'], admin: ['rejected', 'mine-rejected'] },
  superseded: {
    visitor: 403,
    contributor: ['mine-superseded-once-verified', 'mine-superseded-never-verified'],
    moderator: ['superseded-once-verified', 'superseded-never-verified', 'mine-superseded-once-verified', 'mine-superseded-never-verified'],
    admin: ['superseded-once-verified', 'superseded-never-verified', 'mine-superseded-once-verified', 'mine-superseded-never-verified'],
  },
};

export const statusOf = (key: string): StatusFilter | undefined => (key === '(none)' ? undefined : (key as StatusFilter));
