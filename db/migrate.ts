/**
 * Runs every pending migration with Kysely's Migrator: `npm run db:migrate`.
 * `--down` reverts the newest one. Reads DATABASE_URL.
 */
import { Migrator, type MigrationProvider } from 'kysely';
import { createDb } from './client';
import { migrations } from './migrations';

const provider: MigrationProvider = { getMigrations: async () => migrations };

export async function migrateToLatest(url: string): Promise<void> {
  const db = createDb(url, { max: 1 });
  try {
    const migrator = new Migrator({ db, provider });
    const { error, results } = await migrator.migrateToLatest();
    for (const r of results ?? []) {
      console.log(`[migrate] ${r.migrationName}: ${r.status}`);
    }
    if (error) throw error;
  } finally {
    await db.destroy();
  }
}

async function main() {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error('DATABASE_URL is not set. `npm start` sets it; see .env.example.');
    process.exit(1);
  }
  if (process.argv.includes('--down')) {
    const db = createDb(url, { max: 1 });
    const { error, results } = await new Migrator({ db, provider }).migrateDown();
    for (const r of results ?? []) console.log(`[migrate] ${r.migrationName}: ${r.status}`);
    await db.destroy();
    if (error) throw error;
    return;
  }
  await migrateToLatest(url);
}

const invokedDirectly = process.argv[1]?.endsWith('migrate.ts');
if (invokedDirectly) {
  main().catch((err) => {
    console.error('[migrate] failed:', err instanceof Error ? err.message : err);
    process.exit(1);
  });
}
