/**
 * `npm test`: the whole suite, on its own ports and folders so that a running `npm start`
 * (ports 3000, 2525, 54320; .data/pg; .next) is never disturbed.
 *
 *  1. npm ci when node_modules is missing or older than package-lock.json
 *  2. a fresh PostgreSQL in .data/test/pg on 127.0.0.1:54329, database unitwise_test
 *  3. migrations (db/migrate.ts) against it
 *  4. vitest run (projects unit + integration), JSON report .data/test/vitest.json
 *  5. next build into .next-test (skipped when the sources did not change; see lib/build.mjs)
 *  6. playwright test (playwright.config.ts starts the mail sink on 2526 and next on 3100),
 *     JSON report .data/test/playwright.json
 *  7. stop the test PostgreSQL, print `tests: N passed, M failed[, K skipped]`, and exit non-zero
 *     when any stage failed. A failed stage skips the stages after it.
 *
 * Flags (for quick local runs): --no-e2e skips 5 and 6; --unit-only runs only the unit project
 * (no PostgreSQL either).
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDeps } from './lib/deps.mjs';
import { UserError, assertPortFree, bin, killTransient, run } from './lib/proc.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
process.chdir(root);
const argv = process.argv.slice(2);
const unitOnly = argv.includes('--unit-only');
const e2e = !unitOnly && !argv.includes('--no-e2e');
const TEST_DIR = path.join(root, '.data/test');
// Another checkout's suite can run beside this one on its own database port (e2e ports stay fixed).
const PG_PORT = Number(process.env.UNITWISE_TEST_PG_PORT || 54329);
const APP_PORT = 3100;
const SMTP_PORT = 2526;
const APP_URL = `http://localhost:${APP_PORT}`;
const VITEST_JSON = path.join(TEST_DIR, 'vitest.json');
const PLAYWRIGHT_JSON = path.join(TEST_DIR, 'playwright.json');
const log = (msg) => console.log(`[test] ${msg}`);

let interrupted = false;
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(signal, () => {
    if (interrupted) return;
    interrupted = true;
    log(`${signal}: stopping`);
    killTransient('SIGINT');
    setTimeout(() => killTransient('SIGKILL'), 15_000).unref();
  });
}

const failures = [];

/** Run one stage; record it as failed when it exits non-zero. Resolves true on success. */
async function stage(name, cmd, args, env) {
  if (interrupted) return false;
  log(`── ${name}`);
  const code = await run(cmd, args, { env, cwd: root });
  if (code !== 0) failures.push(interrupted ? `${name} (interrupted)` : `${name} (exit ${code})`);
  return code === 0 && !interrupted;
}

function readJson(file) {
  try { return JSON.parse(fs.readFileSync(file, 'utf8')); } catch { return null; }
}

/** { passed, failed, skipped } from the vitest and playwright JSON reports that exist. */
function countResults() {
  const total = { passed: 0, failed: 0, skipped: 0 };
  const v = readJson(VITEST_JSON);
  if (v) {
    total.passed += v.numPassedTests ?? 0;
    total.failed += v.numFailedTests ?? 0;
    total.skipped += (v.numPendingTests ?? 0) + (v.numTodoTests ?? 0);
  }
  const p = readJson(PLAYWRIGHT_JSON);
  if (p?.stats) {
    total.passed += (p.stats.expected ?? 0) + (p.stats.flaky ?? 0);
    total.failed += p.stats.unexpected ?? 0;
    total.skipped += p.stats.skipped ?? 0;
    for (const err of p.errors ?? []) console.error(`[test] playwright: ${(err.message ?? '').split('\n')[0]}`);
  }
  return total;
}

async function main() {
  ensureDeps(root, log);
  if (e2e) {
    await assertPortFree(APP_PORT, 'test web server', 'Is another `npm test` running?');
    await assertPortFree(SMTP_PORT, 'test mail sink', 'Is another `npm test` running?');
  }

  const { ensurePostgres, stopPostgresIn } = await import('./lib/postgres.mjs');
  stopPostgresIn(path.join(TEST_DIR, 'pg'), { log });
  fs.rmSync(TEST_DIR, { recursive: true, force: true });
  const tmp = path.join(TEST_DIR, 'tmp');
  const outbox = path.join(TEST_DIR, 'outbox');
  fs.mkdirSync(tmp, { recursive: true });
  fs.mkdirSync(outbox, { recursive: true });

  const env = {
    ...process.env,
    AUTH_SECRET: crypto.randomBytes(32).toString('base64url'), // throwaway, per run
    AUTH_URL: APP_URL,
    APP_URL,
    AUTH_TRUST_HOST: 'true',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(SMTP_PORT),
    SMTP_SECURE: 'false',
    MAIL_FROM: 'Unitwise <no-reply@unitwise.local>',
    OUTBOX_DIR: outbox,
    DEMO_PASSWORD: 'Test-Harbor-Lantern-42',
    NEXT_DIST_DIR: '.next-test',
    NEXT_TELEMETRY_DISABLED: '1',
    TMPDIR: tmp,
  };
  delete env.NODE_ENV; // vitest sets test, next build and next start set production
  delete env.DATABASE_URL;

  let db = null;
  try {
    if (!unitOnly) {
      db = await ensurePostgres({
        dataDir: path.join(TEST_DIR, 'pg'),
        port: PG_PORT,
        user: 'unitwise',
        password: crypto.randomBytes(18).toString('base64url'),
        database: 'unitwise_test',
        options: ['fsync=off', 'synchronous_commit=off', 'full_page_writes=off'], // throwaway data
        log,
      });
      env.DATABASE_URL = db.url;
      if (fs.existsSync(path.join(root, 'db/migrate.ts'))) {
        if (!(await stage('migrations', bin(root, 'tsx'), ['db/migrate.ts'], env))) return;
      } else {
        log('db/migrate.ts not found: skipping migrations');
      }
    }

    const vitestArgs = ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${VITEST_JSON}`];
    if (unitOnly) vitestArgs.push('--project', 'unit');
    if (!(await stage('vitest', bin(root, 'vitest'), vitestArgs, env))) return;
    if (!e2e) return;

    log('── next build (.next-test)');
    const { ensureBuild } = await import('./lib/build.mjs');
    const { code } = await ensureBuild({ root, distDir: '.next-test', env, log });
    if (code !== 0) { failures.push(`next build (exit ${code})`); return; }

    await stage('playwright', bin(root, 'playwright'), ['test'], env); // reporters: playwright.config.ts
  } finally {
    db?.stop();
  }
}

let exitCode = 0;
try {
  await main();
} catch (err) {
  console.error(`error: ${err instanceof UserError ? err.message : err.stack}`);
  failures.push('setup');
}
const { passed, failed, skipped } = countResults();
if (failures.length) {
  log(`failed: ${failures.join(', ')}`);
  exitCode = 1;
}
if (failed) exitCode = 1;
console.log(`tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(interrupted ? 130 : exitCode);
