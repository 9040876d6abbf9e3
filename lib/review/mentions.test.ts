import { describe, expect, it } from 'vitest';
import { commentParts, commentText, excerpt, mentionedIds, mentionToken } from './mentions';

const PRIYA = '11111111-1111-4111-8111-111111111111';
const LENA = '22222222-2222-4222-8222-222222222222';
const names = new Map([
  [PRIYA, 'Priya Nair'],
  [LENA, 'Lena Vogel'],
]);

describe('mentions', () => {
  it('finds each mentioned id once, in order', () => {
    const body = `Hi ${mentionToken(LENA)} and ${mentionToken(PRIYA)}, see above ${mentionToken(LENA)}`;
    expect(mentionedIds(body)).toEqual([LENA, PRIYA]);
  });

  it('shows mentions as names and keeps the text around them', () => {
    const body = `${mentionToken(PRIYA)} the classroom is the unit.`;
    expect(commentText(body, names)).toBe('@Priya Nair the classroom is the unit.');
    expect(commentParts(body, names)).toEqual([
      { kind: 'mention', userId: PRIYA, name: 'Priya Nair' },
      { kind: 'text', text: ' the classroom is the unit.' },
    ]);
  });

  it('names a mention of someone who is no longer a member "someone"', () => {
    expect(commentText(`ask ${mentionToken('33333333-3333-4333-8333-333333333333')}`, names)).toBe('ask @someone');
  });

  it('ignores text that only looks like a mention', () => {
    expect(mentionedIds('mail <@not-an-id> or @Priya')).toEqual([]);
  });

  it('shortens long text for excerpts', () => {
    expect(excerpt('a  b\n c')).toBe('a b c');
    expect(excerpt('x'.repeat(200), 10)).toBe(`${'x'.repeat(9)}…`);
  });
});
