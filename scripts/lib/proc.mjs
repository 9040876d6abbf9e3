/**
 * Small process helpers shared by scripts/start.mjs and scripts/test.mjs.
 * Node built-ins only, so they work before `npm ci` has run.
 *
 *   UserError          an error whose message is shown to the user without a stack trace
 *   run(cmd, args)     run a command to completion, inheriting stdio; resolves to its exit code
 *   spawnService(...)  start a long-running child in its own process group; .stop() ends the group
 *   assertPortFree()   throw a UserError when something already listens on a TCP port
 *   waitForUrl()       poll a URL until it answers 200
 *   bin(root, name)    path of a tool in node_modules/.bin (what `npx name` would run)
 */
import { spawn } from 'node:child_process';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

export class UserError extends Error {}

export const bin = (root, name) => path.join(root, 'node_modules', '.bin', name);

/** Live children (each in its own process group), killed on exit as a last resort. */
const liveGroups = new Set();
/** Short-lived children started with run(); killTransient() ends them (used on Ctrl-C). */
const current = new Set();
process.on('exit', () => {
  for (const pid of liveGroups) {
    try { process.kill(-pid, 'SIGKILL'); } catch { /* already gone */ }
  }
});

/** Run a command to completion. Resolves to its exit code (128+n when killed by signal n). */
export function run(cmd, args, { env = process.env, cwd, stdio = 'inherit' } = {}) {
  return new Promise((resolve, reject) => {
    // Own process group: a Ctrl-C reaches only us, and we decide how to stop the child.
    const child = spawn(cmd, args, { env, cwd, stdio, detached: true });
    liveGroups.add(child.pid);
    current.add(child);
    child.on('error', (err) => { liveGroups.delete(child.pid); current.delete(child); reject(err); });
    child.on('exit', (code, signal) => {
      liveGroups.delete(child.pid);
      current.delete(child);
      resolve(code ?? 128 + (os.constants.signals[signal] ?? 1));
    });
  });
}

/** Send signal to the process groups of all children started with run(). */
export function killTransient(signal = 'SIGTERM') {
  for (const child of current) {
    try { process.kill(-child.pid, signal); } catch { /* gone */ }
  }
}

/**
 * Start a long-running child in its own process group. Returns
 * { child, exited: Promise<code>, stop(timeoutMs) } where stop() sends SIGTERM to the group,
 * then SIGKILL after timeoutMs.
 */
export function spawnService(cmd, args, { env = process.env, cwd } = {}) {
  const child = spawn(cmd, args, { env, cwd, stdio: 'inherit', detached: true });
  liveGroups.add(child.pid);
  const exited = new Promise((resolve) => {
    child.on('error', () => resolve(127));
    child.on('exit', (code, signal) => {
      liveGroups.delete(child.pid);
      resolve(code ?? (signal === 'SIGTERM' || signal === 'SIGINT' ? 0 : 1));
    });
  });
  async function stop(timeoutMs = 10_000) {
    if (child.exitCode !== null || child.signalCode !== null) return exited;
    try { process.kill(-child.pid, 'SIGTERM'); } catch { /* gone */ }
    const timer = setTimeout(() => {
      try { process.kill(-child.pid, 'SIGKILL'); } catch { /* gone */ }
    }, timeoutMs);
    const code = await exited;
    clearTimeout(timer);
    return code;
  }
  return { child, exited, stop };
}

/** True when something accepts TCP connections on host:port. */
export function isListening(port, host = '127.0.0.1', timeoutMs = 1000) {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host });
    const done = (result) => { socket.destroy(); resolve(result); };
    socket.setTimeout(timeoutMs, () => done(false));
    socket.once('connect', () => done(true));
    socket.once('error', () => done(false));
  });
}

/** Throw a UserError when port is already in use (on IPv4 or IPv6 loopback). */
export async function assertPortFree(port, what, hint = '') {
  const taken = (await isListening(port, '127.0.0.1')) || (await isListening(port, '::1'));
  if (taken) {
    throw new UserError(
      `port ${port} (${what}) is already in use by another program.` + (hint ? ` ${hint}` : ''),
    );
  }
}

/**
 * Poll url until it answers 200. Resolves { ok, status }. Gives up after timeoutMs or as soon as
 * `abort` (a promise) settles, e.g. when the server process exits.
 */
export async function waitForUrl(url, { timeoutMs = 120_000, abort } = {}) {
  let aborted = false;
  abort?.then(() => { aborted = true; }, () => { aborted = true; });
  const deadline = Date.now() + timeoutMs;
  let status = 0;
  while (!aborted && Date.now() < deadline) {
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(5000) });
      status = res.status;
      await res.arrayBuffer();
      if (res.ok) return { ok: true, status };
    } catch { /* not up yet */ }
    await new Promise((r) => setTimeout(r, 500));
  }
  return { ok: false, status, aborted };
}
