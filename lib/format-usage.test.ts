/**
 * Numbers, percentages, plurals and dates reach a reader only through lib/format.ts (one locale,
 * one time zone, the minus sign U+2212): no other source of the app (outside comments and tests)
 * calls `toLocaleString(` or builds its own Intl number, date or plural formatter. Numbers that
 * feed an input, a CSS width or an API value are written with `String(x)` or `toFixed`, which
 * this does not forbid.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const root = path.resolve(__dirname, '..');
const DIRS = ['app', 'components', 'lib'];
const FORBIDDEN = ['toLocaleString(', 'toLocaleDateString(', 'toLocaleTimeString(', 'Intl.NumberFormat(', 'Intl.DateTimeFormat(', 'Intl.PluralRules('];

function sources(): string[] {
  return DIRS.flatMap((dir) =>
    fs
      .readdirSync(path.join(root, dir), { recursive: true, encoding: 'utf8' })
      .map((f) => path.posix.join(dir, f.split(path.sep).join('/')))
      .filter((f) => /\.tsx?$/.test(f) && !/\.test\.tsx?$/.test(f) && f !== 'lib/format.ts'),
  );
}

/** The code without its comments (block comments and whole-line `//` comments). */
const withoutComments = (code: string) => code.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');

describe('one formatting module', () => {
  it('finds the sources', () => {
    expect(sources()).toEqual(expect.arrayContaining(['lib/sim/spec.ts', 'components/stress-test/verdict-grid.tsx']));
  });

  it('no source formats numbers or dates for a reader outside lib/format.ts', () => {
    const found = sources().flatMap((file) => {
      const lines = withoutComments(fs.readFileSync(path.join(root, file), 'utf8')).split('\n');
      return lines.flatMap((line, i) => FORBIDDEN.filter((f) => line.includes(f)).map((f) => `${file}:${i + 1}: ${f} — use lib/format.ts`));
    });
    expect(found).toEqual([]);
  });
});
