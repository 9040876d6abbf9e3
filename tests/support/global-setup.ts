/**
 * Integration tests need DATABASE_URL pointing at a disposable database; `npm test` starts a
 * fresh PostgreSQL for them (scripts/test.mjs). Migrations run once here.
 */
import { migrateToLatest } from '../../db/migrate';

export default async function setup() {
  const url = process.env.DATABASE_URL;
  if (!url || !/test/.test(url)) {
    throw new Error('Integration tests need DATABASE_URL of a test database (its name must contain "test"). Run `npm test`.');
  }
  process.env.AUTH_SECRET ??= 'integration-test-secret-integration-test-secret';
  await migrateToLatest(url);
}
