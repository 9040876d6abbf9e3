/**
 * The direction of dependencies: the engine (lib/stats, lib/models, lib/sim) owns its contracts
 * and is imported by the app, never the other way round; the leaves (the bibliography, the text
 * schemas) import nothing of the app. This reads the import statements of the sources and follows
 * them through every module they reach, so a way round through a third module fails too.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const root = path.resolve(__dirname, '..');

const ENGINE = ['lib/stats', 'lib/models', 'lib/sim'];
const LEAVES = ['lib/citations.ts', 'lib/field-messages.ts', 'lib/format.ts', 'lib/text-schema.ts'];
/** What sits above the engine: request envelopes, the checks, the Plan, the server and the UI. */
const ABOVE = ['lib/validation', 'lib/rules', 'lib/plan', 'lib/api', 'lib/data', 'lib/jobs', 'lib/auth', 'lib/mail', 'lib/db.ts', 'db/', 'components/', 'app/'];

const isTest = (file: string) => /\.test\.tsx?$/.test(file) || file.includes('/fixtures/') || file.endsWith('test-helpers.ts');

function sources(dir: string): string[] {
  return fs
    .readdirSync(path.join(root, dir), { recursive: true, encoding: 'utf8' })
    .filter((f) => /\.tsx?$/.test(f))
    .map((f) => path.posix.join(dir, f.split(path.sep).join('/')));
}

/** The modules of the app that `file` imports (repository paths); packages are left out. */
function appImports(file: string): string[] {
  const code = fs.readFileSync(path.join(root, file), 'utf8');
  const specifiers = [...code.matchAll(/(?:from|import)\s*\(?\s*'([^']+)'/g)].map((m) => m[1]!);
  return specifiers.flatMap((s) => {
    let target: string;
    if (s.startsWith('@/')) target = s.slice(2);
    else if (s.startsWith('.')) target = path.posix.join(path.posix.dirname(file), s);
    else return [];
    const found = [`${target}.ts`, `${target}.tsx`, `${target}/index.ts`, target].find((c) => fs.existsSync(path.join(root, c)) && fs.statSync(path.join(root, c)).isFile());
    return [found ?? target];
  });
}

const above = (file: string) => ABOVE.some((a) => file === a || file.startsWith(a.endsWith('/') || a.endsWith('.ts') ? a : `${a}/`));

/** Every module reached from `file`, each with the chain of imports that reaches it. */
function reached(file: string): Map<string, string[]> {
  const chains = new Map<string, string[]>([[file, [file]]]);
  const queue = [file];
  while (queue.length > 0) {
    const current = queue.shift()!;
    for (const next of appImports(current)) {
      if (chains.has(next)) continue;
      chains.set(next, [...chains.get(current)!, next]);
      if (!above(next)) queue.push(next);
    }
  }
  return chains;
}

describe('dependency direction', () => {
  const engine = ENGINE.flatMap(sources);

  it('finds the engine', () => {
    expect(engine).toContain('lib/sim/spec.ts');
    expect(engine).toContain('lib/stats/calculations/request.ts');
    expect(engine.length).toBeGreaterThan(100);
  });

  it('the engine’s sources reach nothing above it, directly or through another module', () => {
    const wrong = engine
      .filter((f) => !isTest(f))
      .flatMap((f) => [...reached(f).entries()].filter(([m]) => above(m)).map(([, chain]) => chain.join(' → ')));
    expect(wrong).toEqual([]);
  });

  it('the engine’s tests import nothing above it but the demo designs they check', () => {
    const wrong = engine
      .filter(isTest)
      .flatMap((f) => appImports(f).filter((m) => above(m) && !m.startsWith('db/demo/')).map((m) => `${f} → ${m}`));
    expect(wrong).toEqual([]);
  });

  it.each(LEAVES)('%s imports nothing of the app but other leaves', (leaf) => {
    expect(appImports(leaf).filter((m) => !LEAVES.includes(m))).toEqual([]);
  });
});
