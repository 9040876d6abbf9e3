/**
 * ensureDeps(root): install npm dependencies when node_modules is missing or older than
 * package-lock.json (`npm ci`; `npm install` when there is no lock file).
 * Node built-ins only: this runs before anything else is installed.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const mtime = (file) => {
  try { return fs.statSync(file).mtimeMs; } catch { return null; }
};

export function ensureDeps(root, log = console.log) {
  const lock = path.join(root, 'package-lock.json');
  // npm rewrites node_modules/.package-lock.json on every install: its age is the install's age.
  const installed = mtime(path.join(root, 'node_modules', '.package-lock.json'));
  const locked = mtime(lock);
  if (installed !== null && (locked === null || installed >= locked)) return false;

  const args = locked === null ? ['install'] : ['ci'];
  log(installed === null
    ? `node_modules is missing: running npm ${args[0]}`
    : `package-lock.json is newer than node_modules: running npm ${args[0]}`);
  const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm';
  const res = spawnSync(npm, [...args, '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' });
  if (res.status !== 0) {
    console.error(`error: npm ${args[0]} failed (exit ${res.status ?? res.signal})`);
    process.exit(1);
  }
  return true;
}
