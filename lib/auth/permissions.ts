import type { Role } from '@/db/schema';

/**
 * The whole authorization policy: every role × action decision lives in this table.
 * Server actions and route handlers call `assertCan`; pages call `can` to hide controls.
 */
export const ACTIONS = [
  'project.view', // open the project at all
  'project.create',
  'lines.read', // line list, results, design basis (read)
  'lines.edit', // upload / edit the line list
  'designBasis.edit',
  'design.pick', // choose thickness per line
  'calc.run', // calculation API
  'tokens.create', // personal access tokens for scripts
  'review.read',
  'review.request',
  'review.dispose',
  'review.signoff',
  'budget.read',
  'budget.edit',
  'boq.read', // web view and issued downloads
  'boq.issue',
  'report.read', // issued design-report revisions
  'report.issue',
  'comments.read', // comments on a line
  'comments.write', // add a comment or a reply
  'members.read',
  'members.manage', // invite, change role, remove
  'org.settings',
] as const;
export type Action = (typeof ACTIONS)[number];

export const ROLES: readonly Role[] = ['owner', 'engineer', 'reviewer', 'contractor'];

export const ROLE_LABEL: Record<Role, string> = {
  owner: 'Owner',
  engineer: 'Engineer',
  reviewer: 'Safety reviewer',
  contractor: 'Contractor',
};

const O = 'owner',
  E = 'engineer',
  R = 'reviewer',
  C = 'contractor';
const MATRIX: Record<Action, readonly Role[]> = {
  'project.view': [O, E, R, C],
  'project.create': [O, E],
  'lines.read': [O, E, R],
  'lines.edit': [O, E],
  'designBasis.edit': [O, E],
  'design.pick': [O, E],
  'calc.run': [O, E, R],
  'tokens.create': [O, E],
  'review.read': [O, E, R],
  'review.request': [O, E],
  'review.dispose': [R],
  'review.signoff': [R],
  'budget.read': [O, E, R],
  'budget.edit': [O, E],
  'boq.read': [O, E, R, C],
  'boq.issue': [O, E],
  'report.read': [O, E, R, C],
  'report.issue': [O, E],
  // Comments are the engineer's and the reviewer's conversation about a line (the owner takes part).
  // A contractor sees issued documents only, not the line list, so neither reads nor writes them.
  'comments.read': [O, E, R],
  'comments.write': [O, E, R],
  'members.read': [O, E, R],
  'members.manage': [O],
  'org.settings': [O],
};

export function can(role: Role | null | undefined, action: Action): boolean {
  return !!role && MATRIX[action].includes(role);
}

/**
 * What an API token may be allowed to do, and the action each scope stands for. A token's scopes
 * are limited to what its maker's role allows when it is made, and are checked again against the
 * current role at every use (a role taken away takes the token's power with it).
 */
export const TOKEN_SCOPES = ['calc', 'recommend', 'lines:read', 'lines:write'] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

export const SCOPE_ACTION: Record<TokenScope, Action> = {
  calc: 'calc.run',
  recommend: 'calc.run',
  'lines:read': 'lines.read',
  'lines:write': 'design.pick',
};

export const SCOPE_LABEL: Record<TokenScope, string> = {
  calc: 'Heat-loss calculation (POST /api/v1/calc)',
  recommend: 'Recommendations (POST /api/v1/recommend)',
  'lines:read': "Read a project's line table",
  'lines:write': "Choose a line's thickness",
};

/** The scopes a role may put on a token (none for a role that may not make tokens). */
export function scopesForRole(role: Role | null | undefined): TokenScope[] {
  if (!can(role, 'tokens.create')) return [];
  return TOKEN_SCOPES.filter((s) => can(role, SCOPE_ACTION[s]));
}
