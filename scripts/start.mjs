/**
 * `npm start`: run Unitwise locally with everything it needs, from a fresh clone.
 * (`npm run dev` = `node scripts/start.mjs --dev`: Next's development mode instead of a build.)
 *
 *  1. npm ci when node_modules is missing or older than package-lock.json
 *  2. development secrets in .env.local (generated once; existing values are kept)
 *  3. PostgreSQL from .data/pg on 127.0.0.1:54320 (reused when already running)
 *  4. the mail sink on 127.0.0.1:2525, storing mail in .data/outbox
 *  5. migrations (db/migrate.ts), then the demo seed (db/seed.ts, idempotent)
 *  6. `next build` when the sources changed since the last build (see lib/build.mjs)
 *  7. the web server (scripts/serve.ts, as `npm run serve`) on 127.0.0.1:3000, and a banner with the
 *     URL and the demo accounts once /api/health answers. Only this machine can reach it:
 *     `--host 0.0.0.0` (or LISTEN_HOST) opens it to the network, and then the outbox page is off,
 *     because it lists every password-reset link the app sends (lib/outbox.ts)
 *  8. a stress-test worker process beside the web server (lib/jobs/worker-main.ts, the same as
 *     `npm run worker`), restarted when it dies; `--no-worker` leaves it out (when workers run on
 *     other machines). A separate process rather than next's instrumentation hook: simulations
 *     keep every core busy, and in their own process they never slow the web server's requests,
 *     a crash in one cannot take the site down, and the code is the one `npm run worker` runs.
 * Ctrl-C or SIGTERM stops the web server, the worker and the mail sink, and PostgreSQL if this
 * run started it.
 *
 * Variables for the app: a value set in the environment wins over .env.local, which wins over the
 * defaults below (NODE_ENV and NEXT_TELEMETRY_DISABLED are always set here).
 * Only Node built-ins are imported statically: the rest is imported after step 1.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDeps } from './lib/deps.mjs';
import { ensureLocalSecrets } from './lib/env.mjs';
import { listenPlan } from './lib/listen.mjs';
import { UserError, assertPortFree, bin, killTransient, run, spawnService, waitForUrl } from './lib/proc.mjs';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
process.chdir(root);
const dev = process.argv.includes('--dev');
const withWorker = !process.argv.includes('--no-worker');
const PORT = 3000;
const SMTP_PORT = 2525;
const PG_PORT = 54320;
const APP_URL = `http://localhost:${PORT}`;
const listen = listenPlan(process.argv, process.env, PORT);
const log = (msg) => console.log(`[start] ${msg}`);

// ---- shutdown: undo what we started, newest first -------------------------------------------
const cleanups = [];
let stopping = false;
async function shutdown(code) {
  if (stopping) return;
  stopping = true;
  killTransient();
  for (const fn of cleanups.reverse()) {
    try { await fn(); } catch (err) { console.error(`[start] while stopping: ${err.message}`); }
  }
  process.exit(code);
}
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(signal, () => {
    if (!stopping) log(`${signal}: stopping`);
    shutdown(0);
  });
}

/** Thrown to unwind main() once a signal has started the shutdown. */
const STOPPED = new Error('stopped');

async function step(what, cmd, args, env) {
  if (stopping) throw STOPPED;
  const code = await run(cmd, args, { env, cwd: root });
  if (stopping) throw STOPPED;
  if (code !== 0) throw new UserError(`${what} failed (exit ${code})`);
}

async function main() {
  ensureDeps(root, log);

  const { values: local, added } = ensureLocalSecrets(path.join(root, '.env.local'));
  if (added.length) log(`generated ${added.join(', ')} in .env.local`);
  const pick = (key, fallback) => process.env[key] || local[key] || fallback;

  const { ensurePostgres } = await import('./lib/postgres.mjs');
  const db = await ensurePostgres({
    dataDir: path.join(root, '.data/pg'),
    port: PG_PORT,
    user: 'unitwise',
    password: pick('UNITWISE_DB_PASSWORD'),
    database: 'unitwise',
    log: (m) => console.log(`[postgres] ${m}`),
  });
  if (db.startedByUs) cleanups.push(() => db.stop());

  // A second `npm start` gets this far (sharing the first one's database), then stops here.
  await assertPortFree(PORT, 'Unitwise web server', 'Is another `npm start` or `npm run dev` running?');
  await assertPortFree(SMTP_PORT, 'mail sink', 'Is another `npm start` running?');

  const outbox = path.join(root, '.data/outbox');
  const { startMailSink } = await import('./mail-sink.mjs');
  const sink = await startMailSink({ port: SMTP_PORT, dir: outbox });
  cleanups.push(() => sink.close());
  log(`mail sink on 127.0.0.1:${SMTP_PORT} → .data/outbox`);

  const env = {
    ...local,
    ...process.env,
    DATABASE_URL: pick('DATABASE_URL', db.url),
    AUTH_SECRET: pick('AUTH_SECRET'),
    AUTH_URL: pick('AUTH_URL', APP_URL),
    APP_URL: pick('APP_URL', APP_URL),
    AUTH_TRUST_HOST: pick('AUTH_TRUST_HOST', 'true'),
    SMTP_HOST: pick('SMTP_HOST', '127.0.0.1'),
    SMTP_PORT: pick('SMTP_PORT', String(SMTP_PORT)),
    SMTP_SECURE: pick('SMTP_SECURE', 'false'),
    MAIL_FROM: pick('MAIL_FROM', 'Unitwise <no-reply@unitwise.local>'),
    OUTBOX_DIR: pick('OUTBOX_DIR', outbox),
    DEV_OUTBOX: String(listen.outbox),
    LISTEN_HOST: listen.host,
    PORT: String(PORT),
    DEMO_PASSWORD: pick('DEMO_PASSWORD'),
    NEXT_TELEMETRY_DISABLED: '1',
  };
  delete env.NODE_ENV; // tools pick their own; `next start` gets production below

  for (const [what, script] of [['migrations', 'db/migrate.ts'], ['seed', 'db/seed.ts']]) {
    if (!fs.existsSync(path.join(root, script))) { log(`${script} not found: skipping the ${what}`); continue; }
    log(`running ${what} (${script})`);
    await step(what, bin(root, 'tsx'), [script], env);
  }

  if (!dev) {
    const { ensureBuild } = await import('./lib/build.mjs');
    const { code } = await ensureBuild({ root, distDir: env.NEXT_DIST_DIR || '.next', env, log });
    if (stopping) throw STOPPED;
    if (code !== 0) throw new UserError(`next build failed (exit ${code})`);
  }

  if (!listen.outbox) log(`listening on ${listen.host}: reachable from the network, so the outbox page is off (mail is in .data/outbox); set APP_URL to the address others use`);
  const serve = [process.execPath, ['--import', 'tsx', 'scripts/serve.ts', ...(dev ? ['--dev'] : [])]];
  const server = spawnService(serve[0], serve[1], { env: { ...env, NODE_ENV: dev ? 'development' : 'production' }, cwd: root });
  cleanups.push(() => server.stop());
  server.exited.then((code) => {
    if (stopping) return;
    console.error(`[start] the web server exited (code ${code})`);
    shutdown(code || 1);
  });

  if (withWorker) superviseWorker(env);

  const health = await waitForUrl(`${listen.origin}/api/health`, { timeoutMs: dev ? 300_000 : 120_000, abort: server.exited });
  if (stopping || health.aborted) return;
  if (!health.ok) log(`warning: ${listen.origin}/api/health has not answered 200 (last status ${health.status || 'none'})`);
  printBanner(env.DEMO_PASSWORD, env.APP_URL);
}

/**
 * The stress-test worker, restarted when it exits unexpectedly: after 1 s, doubling up to 30 s
 * while it keeps dying within a minute of starting. A chunk it was computing is retried by the
 * queue once it expires, so a restart loses nothing.
 */
function superviseWorker(env) {
  let delayMs = 1000;
  let current = null;
  cleanups.push(() => current?.stop());
  const launch = () => {
    if (stopping) return;
    const startedAt = Date.now();
    // `node --import tsx` (not the tsx command, which runs a second process): signals reach the worker itself.
    current = spawnService(process.execPath, ['--import', 'tsx', 'lib/jobs/worker-main.ts'], { env: { ...env, NODE_ENV: dev ? 'development' : 'production' }, cwd: root });
    current.exited.then((code) => {
      if (stopping) return;
      if (Date.now() - startedAt > 60_000) delayMs = 1000;
      const wait = delayMs;
      delayMs = Math.min(30_000, delayMs * 2);
      console.error(`[start] the stress-test worker exited (code ${code}); restarting it in ${Math.round(wait / 1000)} s`);
      setTimeout(launch, wait);
    });
  };
  launch();
}

function printBanner(demoPassword, appUrl) {
  let accounts = [];
  try { accounts = JSON.parse(fs.readFileSync(path.join(root, 'db/demo/accounts.json'), 'utf8')); } catch { /* none yet */ }
  const width = Math.max(0, ...accounts.map((a) => a.email.length));
  const lines = [
    '',
    `  Unitwise is running at ${appUrl}${dev ? '  (development mode)' : ''}`,
    listen.outbox
      ? `  Mail sent by the app:   ${appUrl}/dev/outbox  (this machine only)`
      : `  Mail sent by the app:   .data/outbox (the outbox page is off while listening on ${listen.host})`,
  ];
  if (accounts.length) {
    lines.push('', `  Demo accounts (password for all: ${demoPassword}):`);
    for (const a of accounts) lines.push(`    ${a.email.padEnd(width)}  ${a.name}, ${a.summary}`);
  }
  lines.push('', '  Press Ctrl-C to stop.', '');
  console.log(lines.join('\n'));
}

main().catch((err) => {
  if (err !== STOPPED && !stopping) console.error(`error: ${err instanceof UserError || err.code === 'EADDRINUSE' ? err.message : err.stack}`);
  shutdown(1);
});
