/**
 * Build only when the sources changed: a sha256 over the build's inputs is kept in
 * `<distDir>/unitwise-build-hash`, and `next build` runs when it is missing or different.
 * Shared by `npm start` (distDir .next) and `npm test` (distDir .next-test, via NEXT_DIST_DIR).
 *
 * Inputs: the folders in INPUT_DIRS and the source files at the top level of the project (configs,
 * package files, and root modules such as auth.ts or proxy.ts), skipping node_modules, build
 * output, .data, test configs and generated files. NEXT_PUBLIC_* variables are inlined at build
 * time, so their values count too. Add a folder to INPUT_DIRS when the app starts importing it.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { bin, run } from './proc.mjs';

export const INPUT_DIRS = ['app', 'components', 'lib', 'db', 'public', 'styles', 'types'];
const ROOT_FILE = /\.(m?[jt]sx?|cjs|cts|json|css)$/;
const ROOT_SKIP = /^(next-env\.d\.ts|vitest\.config\..*|playwright\.config\..*|.*\.tsbuildinfo)$/;
const SKIP_DIR = (name) => name === 'node_modules' || name === '.git' || name === '.data' || name === '.next' || name.startsWith('.next-');

function listFiles(root) {
  const files = [];
  const walk = (rel) => {
    for (const entry of fs.readdirSync(path.join(root, rel), { withFileTypes: true })) {
      const child = path.join(rel, entry.name);
      const stat = entry.isSymbolicLink() ? fs.statSync(path.join(root, child), { throwIfNoEntry: false }) : entry;
      if (stat?.isDirectory()) { if (!SKIP_DIR(entry.name)) walk(child); }
      else if (stat?.isFile()) files.push(child);
    }
  };
  for (const dir of INPUT_DIRS) if (fs.existsSync(path.join(root, dir))) walk(dir);
  for (const entry of fs.readdirSync(root, { withFileTypes: true })) {
    if (entry.isFile() && ROOT_FILE.test(entry.name) && !ROOT_SKIP.test(entry.name)) files.push(entry.name);
  }
  return files.map((f) => f.split(path.sep).join('/')).sort();
}

/** sha256 over the build inputs (paths and contents) and the NEXT_PUBLIC_* variables of env. */
export function sourceHash(root, env = process.env) {
  const hash = crypto.createHash('sha256');
  for (const file of listFiles(root)) {
    const content = crypto.createHash('sha256').update(fs.readFileSync(path.join(root, file))).digest('hex');
    hash.update(`${file}\0${content}\n`);
  }
  for (const key of Object.keys(env).filter((k) => k.startsWith('NEXT_PUBLIC_')).sort()) {
    hash.update(`env ${key}=${env[key]}\n`);
  }
  return hash.digest('hex');
}

/**
 * Run `next build` into distDir unless its stored hash matches the sources.
 * Resolves { built: boolean, code: number } (code is next build's exit code, 0 when skipped).
 */
export async function ensureBuild({ root, distDir = '.next', env = process.env, log = console.log }) {
  const out = path.resolve(root, distDir);
  const hashFile = path.join(out, 'unitwise-build-hash');
  let stored = '';
  try {
    if (fs.existsSync(path.join(out, 'BUILD_ID'))) stored = fs.readFileSync(hashFile, 'utf8').trim();
  } catch { /* no hash yet */ }
  if (stored && stored === sourceHash(root, env)) {
    log(`build in ${distDir} is up to date`);
    return { built: false, code: 0 };
  }
  log(stored ? `sources changed: building into ${distDir}` : `no build in ${distDir} yet: building`);
  fs.rmSync(hashFile, { force: true });
  const code = await run(bin(root, 'next'), ['build'], {
    cwd: root,
    env: { ...env, NEXT_DIST_DIR: distDir, NEXT_TELEMETRY_DISABLED: '1' },
  });
  // Hash after the build: `next build` may rewrite tsconfig.json (and that must not trigger
  // another build next time).
  if (code === 0) fs.writeFileSync(hashFile, sourceHash(root, env) + '\n');
  return { built: true, code };
}
