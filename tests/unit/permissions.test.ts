import { describe, expect, it } from 'vitest';
import { ACTIONS, ROLES, SCOPE_ACTION, can, scopesForRole } from '@/lib/auth/permissions';

// The expected policy written out independently of the module: O = owner, E = engineer,
// R = safety reviewer, C = contractor. Every role × action pair is asserted.
const EXPECTED: Record<string, string> = {
  'project.view': 'OERC',
  'project.create': 'OE',
  'lines.read': 'OER',
  'lines.edit': 'OE',
  'designBasis.edit': 'OE',
  'design.pick': 'OE',
  'calc.run': 'OER',
  'tokens.create': 'OE',
  'review.read': 'OER',
  'review.request': 'OE',
  'review.dispose': 'R',
  'review.signoff': 'R',
  'budget.read': 'OER',
  'budget.edit': 'OE',
  'boq.read': 'OERC',
  'boq.issue': 'OE',
  'report.read': 'OERC',
  'report.issue': 'OE',
  'comments.read': 'OER',
  'comments.write': 'OER',
  'members.read': 'OER',
  'members.manage': 'O',
  'org.settings': 'O',
};
const LETTER = { owner: 'O', engineer: 'E', reviewer: 'R', contractor: 'C' } as const;

describe('authorization matrix', () => {
  it('covers exactly the expected actions', () => {
    expect([...ACTIONS].sort()).toEqual(Object.keys(EXPECTED).sort());
  });
  for (const action of ACTIONS) {
    for (const role of ROLES) {
      const allowed = EXPECTED[action].includes(LETTER[role]);
      it(`${role} ${allowed ? 'may' : 'may not'} ${action}`, () => {
        expect(can(role, action)).toBe(allowed);
      });
    }
  }
  it('denies when there is no membership', () => {
    for (const action of ACTIONS) expect(can(null, action)).toBe(false);
  });
});

describe('token scopes by role', () => {
  it('gives owners and engineers every scope, and reviewers and contractors none (they cannot make tokens)', () => {
    expect(scopesForRole('owner')).toEqual(['calc', 'recommend', 'lines:read', 'lines:write']);
    expect(scopesForRole('engineer')).toEqual(['calc', 'recommend', 'lines:read', 'lines:write']);
    expect(scopesForRole('reviewer')).toEqual([]);
    expect(scopesForRole('contractor')).toEqual([]);
    expect(scopesForRole(null)).toEqual([]);
  });
  it('maps each scope to the action the role must still hold at use', () => {
    expect(SCOPE_ACTION).toEqual({
      calc: 'calc.run',
      recommend: 'calc.run',
      'lines:read': 'lines.read',
      'lines:write': 'design.pick',
    });
  });
});
