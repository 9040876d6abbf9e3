/**
 * Text that names a published source takes its words from lib/citations.ts: no source of the app
 * (outside comments and tests) restates a reference as "Hayes & Bennett 1999" or
 * "Hayes & Bennett (1999)", so a corrected reference changes everywhere it is shown.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import * as citations from './citations';
import { narrative, type Citation } from './citations';

const root = path.resolve(__dirname, '..');
const DIRS = ['lib', 'components', 'app'];

const isCitation = (x: unknown): x is Citation => typeof x === 'object' && x !== null && 'short' in x && 'full' in x;
const all = Object.values(citations).filter(isCitation);

function sources(): string[] {
  return DIRS.flatMap((dir) =>
    fs
      .readdirSync(path.join(root, dir), { recursive: true, encoding: 'utf8' })
      .map((f) => path.posix.join(dir, f.split(path.sep).join('/')))
      .filter((f) => /\.tsx?$/.test(f) && !/\.test\.tsx?$/.test(f) && !/(^|\/)(__)?fixtures(__)?\//.test(f) && f !== 'lib/citations.ts'),
  );
}

/** The code without its comments (block comments and whole-line `//` comments). */
const withoutComments = (code: string) => code.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');

describe('the bibliography', () => {
  it('has the references the calculations and checks cite', () => {
    expect(all.map((c) => c.short)).toEqual(expect.arrayContaining(['Hayes & Bennett 1999', 'Donner & Klar 2000', 'Eldridge, Ashby & Kerry 2006', 'Kenward & Roger 1997']));
    expect(narrative(citations.HAYES_BENNETT_1999)).toBe('Hayes & Bennett (1999)');
  });

  it('is not restated in the app’s sources', () => {
    const restated = sources().flatMap((file) => {
      const code = withoutComments(fs.readFileSync(path.join(root, file), 'utf8'));
      return all.flatMap((c) => [c.short, narrative(c)].filter((words) => code.includes(words)).map((words) => `${file}: "${words}"`));
    });
    expect(restated).toEqual([]);
  });
});
