import { describe, expect, it } from 'vitest';
import { hashPassword, isCommonPassword, verifyPassword } from './password';

describe('common passwords (shipped breach-derived list, @zxcvbn-ts/language-common)', () => {
  it.each(['password', 'Password', '123456789', 'qwertyuiop', 'iloveyou', 'aaaaaaaaaaaa', '12345678901234'])('%s is refused', (p) =>
    expect(isCommonPassword(p)).toBe(true),
  );
  it.each(['violet-harbour-42-lantern', 'Trays are not plants 7'])('%s is accepted', (p) => expect(isCommonPassword(p)).toBe(false));
});

describe('bcrypt hashing', () => {
  it('verifies the right password and refuses a wrong one', async () => {
    const hash = await hashPassword('violet-harbour-42-lantern');
    expect(hash).toMatch(/^\$2[aby]\$10\$/);
    expect(await verifyPassword('violet-harbour-42-lantern', hash)).toBe(true);
    expect(await verifyPassword('violet-harbour-42-lanterN', hash)).toBe(false);
  });
});
