import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { safeCallback } from '@/lib/action-state';
import { signUpSchema } from './auth';
import { text } from '@/lib/text-schema';
import { emailSchema } from './common';
import { studyCreateSchema, studyListQuerySchema } from './study';

describe('emailSchema', () => {
  it('trims and lower-cases', () => expect(emailSchema.parse('  Lena.Vogel@HarrowVale.Example ')).toBe('lena.vogel@harrowvale.example'));
  it.each(['', 'lena', 'lena@', '@example.org', 'a b@example.org'])('refuses %j', (v) => expect(emailSchema.safeParse(v).success).toBe(false));
});

describe('text()', () => {
  const title = text('Title', 1, 200);
  it('refuses control characters but keeps any printable text, scripts included, as text', () => {
    expect(title.safeParse('a\u0000b').success).toBe(false);
    expect(title.parse('<script>alert(1)</script>')).toBe('<script>alert(1)</script>');
  });
  it('never accepts a string over the limit (property)', () => {
    fc.assert(
      fc.property(fc.string({ minLength: 0, maxLength: 400 }), (s) => {
        const r = title.safeParse(s);
        if (r.success) {
          expect(r.data.length).toBeGreaterThanOrEqual(1);
          expect(r.data.length).toBeLessThanOrEqual(200);
        }
      }),
    );
  });
});

describe('signUpSchema', () => {
  it('asks for at least 10 characters of password', () => {
    const r = signUpSchema.safeParse({ name: 'Ada', email: 'ada@example.org', password: 'short' });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0]?.path).toEqual(['password']);
  });
});

describe('study schemas', () => {
  it('needs a workspace id and a title', () => {
    const r = studyCreateSchema.safeParse({ title: '' });
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => i.path[0]).sort()).toEqual(['title', 'workspaceId']);
  });
  it('list query has safe defaults and caps the page size', () => {
    const q = studyListQuerySchema.parse({ workspaceId: '00000000-0000-4000-8000-000000000000' });
    expect(q).toMatchObject({ status: 'active', sort: 'updated', dir: 'desc', page: 1, pageSize: 20 });
    expect(studyListQuerySchema.safeParse({ workspaceId: q.workspaceId, pageSize: '1000' }).success).toBe(false);
  });
});

describe('safeCallback', () => {
  it.each([
    ['/studies/1', '/studies/1'],
    ['https://evil.example/', '/studies'],
    ['//evil.example', '/studies'],
    ['/\\evil.example', '/studies'],
    // A browser drops tabs and line breaks from a Location and reads "\\" as "/".
    ['/\t/evil.example', '/studies'],
    ['/\n/evil.example', '/studies'],
    ['/\r\n/evil.example', '/studies'],
    ['\t//evil.example', '/studies'],
    ['/\t\\evil.example', '/studies'],
    ['/studies?tab=plan#top', '/studies?tab=plan#top'],
    [undefined, '/studies'],
  ])('%j → %j', (input, out) => expect(safeCallback(input)).toBe(out));
});
