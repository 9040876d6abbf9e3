import { describe, expect, it } from 'vitest';
import { ACTIVITY_KINDS, describeActivity, knowsAction } from './words';

/** The action names of the issue-12 brief and the ones logged before it. */
const NAMED = [
  'design.saved', 'version.named', 'version.restored', 'comment.created', 'comment.replied', 'comment.resolved',
  'comment.reopened', 'suggestion.created', 'suggestion.accepted', 'suggestion.declined', 'signoff.created',
  'signoff.withdrawn', 'simulation.started', 'simulation.cancelled', 'plan.saved', 'member.role-changed',
  'member.removed', 'invitation.created', 'invitation.resent', 'invitation.accepted', 'invitation.revoked',
  'study.created', 'study.updated', 'study.archived', 'study.restored', 'finding.addressed', 'finding.reopened',
  'activity.exported',
];

function likeToRegExp(pattern: string): RegExp {
  return new RegExp(`^${pattern.replace(/[.*+?^${}()|[\]\\]/g, '\\$&').replace(/%/g, '.*')}$`);
}

describe('describeActivity', () => {
  it.each(NAMED)('has words of its own for %s, with or without details', (action) => {
    expect(knowsAction(action)).toBe(true);
    const bare = describeActivity({ action, details: {} });
    expect(bare).toMatch(/^[a-z]/);
    expect(bare).not.toContain('undefined');
    expect(bare).not.toContain(action);
  });

  it.each(NAMED)('%s belongs to a kind of event the view filters by', (action) => {
    const kinds = Object.values(ACTIVITY_KINDS).filter((k) => k.patterns.some((p) => likeToRegExp(p).test(action)));
    expect(kinds.length).toBeGreaterThan(0);
  });

  it('uses the details a caller logged', () => {
    expect(describeActivity({ action: 'version.named', details: { version: 4, name: 'sent to the funder' } })).toBe('named version 4 “sent to the funder”');
    expect(describeActivity({ action: 'comment.created', details: { excerpt: 'Is the ICC from a pilot?' } })).toBe('commented: “Is the ICC from a pilot?”');
    expect(describeActivity({ action: 'signoff.withdrawn', details: { name: 'ethics v2', reason: 'The ICC changed' } })).toBe(
      'withdrew the sign-off of version “ethics v2”: “The ICC changed”',
    );
  });

  it('reads an action it does not know as a sentence, never as nothing', () => {
    expect(describeActivity({ action: 'pilot.data-uploaded', details: {} })).toBe('recorded “pilot data uploaded”');
    expect(describeActivity({ action: '', details: {} })).toBe('made a change');
  });

  it('ignores details of the wrong type', () => {
    expect(describeActivity({ action: 'comment.created', details: { excerpt: { nested: true } } })).toBe('commented');
  });
});
