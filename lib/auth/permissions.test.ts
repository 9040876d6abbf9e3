import { describe, expect, it } from 'vitest';
import { STUDY_ROLES } from '@/db/schema';
import { ASSIGNABLE_STUDY_ROLES, canResolveThread, canStudy, canWorkspace, STUDY_ACTIONS, WORKSPACE_ACTIONS, type StudyAction } from './permissions';

/**
 * The roles as PRODUCT.md describes them ("Who uses it"), restated as expectations. The matrix
 * file must agree with this reading of the brief; the integration test then checks that every
 * route enforces the matrix.
 */
const EXPECTED: Record<(typeof STUDY_ROLES)[number], StudyAction[]> = {
  owner: ['study.read', 'study.update', 'study.archive', 'design.edit', 'finding.address', 'calculation.save', 'simulation.run', 'comment.create', 'comment.resolve', 'suggestion.create', 'suggestion.decide', 'justification.edit', 'justification.export', 'members.read', 'members.manage', 'activity.read', 'version.name'],
  editor: ['study.read', 'study.update', 'design.edit', 'finding.address', 'calculation.save', 'simulation.run', 'comment.create', 'comment.resolve', 'suggestion.create', 'suggestion.decide', 'justification.edit', 'justification.export', 'members.read', 'activity.read', 'version.name'],
  consultant: ['study.read', 'finding.address', 'simulation.run', 'comment.create', 'comment.resolve', 'suggestion.create', 'study.signoff', 'justification.export', 'members.read', 'activity.read', 'version.name'],
  writer: ['study.read', 'comment.create', 'justification.edit', 'justification.export', 'members.read', 'activity.read'],
  viewer: ['study.read', 'justification.export', 'members.read', 'activity.read'],
};

describe.each(STUDY_ROLES)('study role %s', (role) => {
  it.each(STUDY_ACTIONS)('%s', (action) => {
    expect(canStudy(role, action)).toBe(EXPECTED[role].includes(action));
  });
});

describe('resolving a thread', () => {
  it.each([
    ['owner', false, true],
    ['editor', false, true],
    ['consultant', false, true],
    ['writer', false, false],
    ['writer', true, true],
    ['viewer', true, false],
  ] as const)('%s, author of the thread: %s → %s', (role, isAuthor, allowed) => expect(canResolveThread(role, isAuthor)).toBe(allowed));
});

describe('workspace roles', () => {
  it.each(WORKSPACE_ACTIONS)('admin may %s', (action) => expect(canWorkspace('admin', action)).toBe(true));
  it.each([
    ['workspace.read', true],
    ['study.create', true],
    ['workspace.members.read', true],
    ['workspace.members.manage', false],
    ['workspace.invite', false],
  ] as const)('member: %s → %s', (action, allowed) => expect(canWorkspace('member', action)).toBe(allowed));
});

describe('edge cases', () => {
  it('no role means no right', () => {
    for (const a of STUDY_ACTIONS) expect(canStudy(null, a)).toBe(false);
    for (const a of WORKSPACE_ACTIONS) expect(canWorkspace(undefined, a)).toBe(false);
  });
  it('only consultants sign off, and the owner role cannot be handed out', () => {
    expect(STUDY_ROLES.filter((r) => canStudy(r, 'study.signoff'))).toEqual(['consultant']);
    expect(ASSIGNABLE_STUDY_ROLES).not.toContain('owner');
  });
});
