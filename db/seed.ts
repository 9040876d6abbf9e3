/**
 * Seeds the invented demo scenario (db/demo), so `npm start` can run it every time:
 * - into a database with no users: the demo accounts, the demo workspace and every demo study;
 * - into one seeded before: the demo studies it does not have yet (one added to the demo since),
 *   in the demo workspace, owned by the demo admin, with those of their demo members who are
 *   still in the workspace. A demo study counts as there when the workspace's activity log
 *   records a study created under its demo title, so a demo study that was renamed or archived
 *   is not added again. A demo study's review in progress (db/demo/review.ts) is added the same way
 *   to a study seeded before it, while that study has no review activity. Nothing happens when the demo admin's account or the demo workspace is
 *   gone (a database of the end-to-end tests, or one where the team removed the demo).
 * Demo accounts share DEMO_PASSWORD, which `npm start` generates into .env.local on first start.
 * Reads DATABASE_URL.
 */
import bcrypt from 'bcryptjs';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { sql, type Kysely, type Transaction } from 'kysely';
import { createDb } from './client';
import type { Database } from './schema';
import { logActivity } from './repositories/activity';
import { insertSignoff } from './repositories/signoffs';
import { insertRevision, insertStudy, upsertStudyMember } from './repositories/studies';
import { insertDemoReview } from './seed-review';
import { closeVersion, findOpenVersion, setVersionName } from './repositories/versions';
import { findUserByEmail, insertUser, setPasswordHash } from './repositories/users';
import { findMembership, insertWorkspace, lockWorkspace, upsertWorkspaceMember } from './repositories/workspaces';
import { DEMO_ADMINS, DEMO_STUDIES, DEMO_WORKSPACE, type DemoStudy } from './demo/studies';
import { designSchema } from '../lib/design/schema';
import { runChecks } from '../lib/rules/registry';
import { logger } from '../lib/log';

const log = logger('seed');

interface DemoAccount {
  email: string;
  name: string;
  summary: string;
}

export function demoAccounts(): DemoAccount[] {
  return JSON.parse(readFileSync(path.join(__dirname, 'demo', 'accounts.json'), 'utf8')) as DemoAccount[];
}

/** What a seed did: created the whole demo, or added the demo studies named (none when it had them all). */
export type SeedResult = { created: true } | { created: false; added: string[] };

type Trx = Transaction<Database>;

/** One demo study, owned by `owner`, with the members `ids` knows; its first revision holds the design and its checks. */
export async function insertDemoStudy(trx: Trx, workspaceId: string, owner: string, s: DemoStudy, ids: Map<string, string>) {
  const study = await insertStudy(trx, { workspaceId, title: s.title, description: s.description, createdBy: owner });
  for (const [email, role] of Object.entries(s.members)) {
    const id = ids.get(email);
    if (id) await upsertStudyMember(trx, study.id, id, role);
  }
  const design = designSchema.parse(s.design);
  await insertRevision(trx, { studyId: study.id, number: 1, design, checks: runChecks(design), authorId: owner, note: 'Study created' });
  await logActivity(trx, { workspaceId, studyId: study.id, actorId: owner, action: 'study.created', details: { title: s.title } });
  if (s.review) await insertDemoReview(trx, { id: study.id, workspaceId, revision: 1 }, design, s.review, ids);
  const signer = s.signoff && ids.get(s.signoff.by);
  if (s.signoff && signer) await signOffFirstVersion(trx, workspaceId, study.id, signer, s.signoff);
}

/** The consultant names the first version and signs it off, as the app does (closing it first). */
async function signOffFirstVersion(trx: Trx, workspaceId: string, studyId: string, signer: string, so: NonNullable<DemoStudy['signoff']>) {
  const at = new Date();
  const open = await findOpenVersion(trx, studyId);
  if (!open) return;
  await closeVersion(trx, studyId, open, at, 'signoff');
  await setVersionName(trx, studyId, open.number, so.versionName, signer, at);
  await logActivity(trx, { workspaceId, studyId, actorId: signer, action: 'version.named', details: { version: open.number, name: so.versionName, previous: null } });
  const id = await insertSignoff(trx, { studyId, versionNumber: open.number, revisionNumber: 1, signerId: signer, statement: so.statement, conditions: so.conditions ?? null, at });
  await logActivity(trx, { workspaceId, studyId, actorId: signer, action: 'signoff.created', details: { signoffId: id, version: open.number, name: so.versionName, excerpt: so.statement.slice(0, 200) } });
}

export async function seedDemo(db: Kysely<Database>, password: string, studies: DemoStudy[] = DEMO_STUDIES): Promise<SeedResult> {
  const { rows } = await sql<{ n: string }>`select count(*) as n from "User"`.execute(db);
  if (Number(rows[0]?.n ?? 0) > 0) return { created: false, added: await addMissingDemoStudies(db, studies) };
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
    for (const s of studies) await insertDemoStudy(trx, ws.id, owner, s, ids);
  });
  return { created: true };
}

/** The titles of the demo studies added to a database seeded before (see the file's comment). */
async function addMissingDemoStudies(db: Kysely<Database>, studies: DemoStudy[]): Promise<string[]> {
  const admin = await findUserByEmail(db, DEMO_ADMINS[0]!);
  if (!admin) return [];
  const ws = await db
    .selectFrom('workspaces')
    .select('id')
    .where('name', '=', DEMO_WORKSPACE)
    .where('created_by', '=', admin.id)
    .orderBy('created_at')
    .executeTakeFirst();
  if (!ws) return [];
  return db.transaction().execute(async (trx) => {
    if (!(await lockWorkspace(trx, ws.id, 'update'))) return [];
    if ((await findMembership(trx, ws.id, admin.id)) === undefined) return [];
    const seeded = await trx
      .selectFrom('activity_log')
      .select([sql<string>`details->>'title'`.as('title'), 'study_id'])
      .where('workspace_id', '=', ws.id)
      .where('action', '=', 'study.created')
      .execute();
    const had = new Set(seeded.map((r) => r.title));
    await addMissingDemoReviews(trx, ws.id, studies, seeded);
    const missing = studies.filter((s) => !had.has(s.title));
    if (missing.length === 0) return [];
    const ids = new Map<string, string>();
    for (const email of new Set(missing.flatMap((s) => Object.keys(s.members)))) {
      const u = await findUserByEmail(trx, email);
      if (u && (await findMembership(trx, ws.id, u.id)) !== undefined) ids.set(email, u.id);
    }
    for (const s of missing) await insertDemoStudy(trx, ws.id, admin.id, s, ids);
    return missing.map((s) => s.title);
  });
}

/**
 * A demo review added to a demo study of a database seeded before it: once, while the study has
 * no review activity at all (so neither twice, nor over a review the team started themselves).
 */
async function addMissingDemoReviews(trx: Trx, workspaceId: string, studies: DemoStudy[], seeded: { title: string; study_id: string | null }[]) {
  for (const s of studies) {
    const studyId = s.review && seeded.find((r) => r.title === s.title)?.study_id;
    if (!s.review || !studyId) continue;
    const reviewed = await trx
      .selectFrom('activity_log')
      .select('id')
      .where('study_id', '=', studyId)
      .where((eb) => eb.or([eb('action', 'like', 'comment.%'), eb('action', 'like', 'suggestion.%')]))
      .executeTakeFirst();
    const study = await trx.selectFrom('studies').select(['current_revision', 'status']).where('id', '=', studyId).executeTakeFirst();
    if (reviewed || !study || study.status === 'archived') continue;
    const rev = await trx.selectFrom('study_revisions').select('design').where('study_id', '=', studyId).where('number', '=', study.current_revision).executeTakeFirst();
    const design = designSchema.safeParse(rev?.design ?? {});
    if (!design.success) continue;
    const ids = new Map<string, string>();
    for (const email of Object.keys(s.members)) {
      const u = await findUserByEmail(trx, email);
      const member = u && (await trx.selectFrom('study_members').select('role').where('study_id', '=', studyId).where('user_id', '=', u.id).executeTakeFirst());
      if (u && member) ids.set(email, u.id);
    }
    await insertDemoReview(trx, { id: studyId, workspaceId, revision: study.current_revision }, design.data, s.review, ids);
    log.info(`added the demo review to ${s.title}`);
  }
}

async function main() {
  const url = process.env.DATABASE_URL;
  const password = process.env.DEMO_PASSWORD;
  if (!url) throw new Error('DATABASE_URL is not set. `npm start` sets it; see .env.example.');
  if (!password || password.length < 10) throw new Error('DEMO_PASSWORD (at least 10 characters) is not set. `npm start` generates it.');
  const db = createDb(url, { max: 2 });
  try {
    const seeded = await seedDemo(db, password);
    if (seeded.created) log.info('demo scenario created');
    else if (seeded.added.length > 0) log.info(`added ${seeded.added.length === 1 ? 'a demo study' : `${seeded.added.length} demo studies`} to the demo workspace: ${seeded.added.join('; ')}`);
    else log.info('database already has users and no demo study to add; nothing seeded');
  } finally {
    await db.destroy();
  }
}

if (process.argv[1]?.endsWith('seed.ts')) {
  main().catch((err) => {
    log.error(`failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exit(1);
  });
}
