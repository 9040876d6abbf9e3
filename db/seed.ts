/**
 * Seeds the invented demo scenario (db/demo) when the database has no users yet; otherwise it
 * does nothing, so `npm start` can run it every time. Demo accounts share DEMO_PASSWORD, which
 * `npm start` generates into .env.local on first start. Reads DATABASE_URL.
 */
import bcrypt from 'bcryptjs';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { sql, type Kysely } from 'kysely';
import { createDb } from './client';
import type { Database } from './schema';
import { logActivity } from './repositories/activity';
import { insertRevision, insertStudy, upsertStudyMember } from './repositories/studies';
import { insertUser, setPasswordHash } from './repositories/users';
import { insertWorkspace, upsertWorkspaceMember } from './repositories/workspaces';
import { DEMO_ADMINS, DEMO_STUDIES, DEMO_WORKSPACE } from './demo/studies';
import { designSchema } from '../lib/design/schema';
import { runChecks } from '../lib/rules/registry';

interface DemoAccount {
  email: string;
  name: string;
  summary: string;
}

export function demoAccounts(): DemoAccount[] {
  return JSON.parse(readFileSync(path.join(__dirname, 'demo', 'accounts.json'), 'utf8')) as DemoAccount[];
}

export async function seedDemo(db: Kysely<Database>, password: string): Promise<boolean> {
  const { rows } = await sql<{ n: string }>`select count(*) as n from "User"`.execute(db);
  if (Number(rows[0]?.n ?? 0) > 0) return false;
  const hash = await bcrypt.hash(password, 10);
  await db.transaction().execute(async (trx) => {
    const ids = new Map<string, string>();
    for (const a of demoAccounts()) {
      const u = await insertUser(trx, { name: a.name, email: a.email, emailVerified: new Date() });
      await setPasswordHash(trx, u.id, hash);
      ids.set(a.email, u.id);
    }
    const owner = ids.get(DEMO_ADMINS[0]!)!;
    const ws = await insertWorkspace(trx, { name: DEMO_WORKSPACE, createdBy: owner });
    for (const [email, id] of ids) await upsertWorkspaceMember(trx, ws.id, id, DEMO_ADMINS.includes(email) ? 'admin' : 'member');
    for (const s of DEMO_STUDIES) {
      const study = await insertStudy(trx, { workspaceId: ws.id, title: s.title, description: s.description, createdBy: owner });
      for (const [email, role] of Object.entries(s.members)) await upsertStudyMember(trx, study.id, ids.get(email)!, role);
      const design = designSchema.parse(s.design);
      await insertRevision(trx, { studyId: study.id, number: 1, design, checks: runChecks(design), authorId: owner, note: 'Study created' });
      await logActivity(trx, { workspaceId: ws.id, studyId: study.id, actorId: owner, action: 'study.created', details: { title: s.title } });
    }
  });
  return true;
}

async function main() {
  const url = process.env.DATABASE_URL;
  const password = process.env.DEMO_PASSWORD;
  if (!url) throw new Error('DATABASE_URL is not set. `npm start` sets it; see .env.example.');
  if (!password || password.length < 10) throw new Error('DEMO_PASSWORD (at least 10 characters) is not set. `npm start` generates it.');
  const db = createDb(url, { max: 2 });
  try {
    const seeded = await seedDemo(db, password);
    console.log(seeded ? '[seed] demo scenario created' : '[seed] database already has users; nothing seeded');
  } finally {
    await db.destroy();
  }
}

if (process.argv[1]?.endsWith('seed.ts')) {
  main().catch((err) => {
    console.error('[seed] failed:', err instanceof Error ? err.message : err);
    process.exit(1);
  });
}
