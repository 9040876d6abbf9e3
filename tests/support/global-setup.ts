/**
 * Integration tests need DATABASE_URL pointing at a disposable database; `npm test` starts a
 * fresh PostgreSQL for them (scripts/test.mjs). Migrations run once here.
 *
 * At the end, the run's coverage of the API document: which route × method × 2xx status
 * combinations the suite received and checked (tests/support/api-contract.ts), and which
 * declared ones it never received.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { migrateToLatest } from '../../db/migrate';
import { declaredSuccesses } from './api-contract';

declare module 'vitest' {
  export interface ProvidedContext {
    /** Where each test file writes the route × method × status combinations it exercised. */
    apiContractDir: string;
  }
}

export default async function setup(project: TestProject) {
  const url = process.env.DATABASE_URL;
  if (!url || !/test/.test(url)) {
    throw new Error('Integration tests need DATABASE_URL of a test database (its name must contain "test"). Run `npm test`.');
  }
  process.env.AUTH_SECRET ??= 'integration-test-secret-integration-test-secret';
  await migrateToLatest(url);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'unitwise-api-contract-'));
  project.provide('apiContractDir', dir);
  return () => {
    const exercised = new Set<string>();
    for (const file of fs.readdirSync(dir)) for (const key of JSON.parse(fs.readFileSync(path.join(dir, file), 'utf8')) as string[]) exercised.add(key);
    fs.rmSync(dir, { recursive: true, force: true });
    const declared = declaredSuccesses();
    const missed = declared.filter((k) => !exercised.has(k));
    console.log(`API document: ${exercised.size} route × method × status combinations received and checked against their schemas (${declared.length} 2xx declared).`);
    if (missed.length) console.log(`Declared but never received:\n  ${missed.join('\n  ')}`);
  };
}
