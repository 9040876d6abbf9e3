/**
 * The end-to-end database is not seeded with the demo (other specs create their own people), so
 * the review spec seeds the demo's classroom study itself, the way db/seed.ts does — its design,
 * its owner and consultant, and its review in progress (db/demo/review.ts) — under addresses of
 * this run, and then signs in through the app like anyone.
 */
import bcrypt from 'bcryptjs';
import { createDb } from '../../../db/client';
import { DEMO_STUDIES, DEMO_WORKSPACE } from '../../../db/demo/studies';
import { insertUser, setPasswordHash } from '../../../db/repositories/users';
import { insertWorkspace, upsertWorkspaceMember } from '../../../db/repositories/workspaces';
import { insertDemoStudy } from '../../../db/seed';
import { STRONG_PASSWORD, uniqueEmail } from './test-data';

export const PRIYA = 'priya.nair@harrowvale.example';
export const LENA = 'lena.vogel@harrowvale.example';

export interface DemoPerson {
  name: string;
  email: string;
  password: string;
}

export async function seedClassroomReview(): Promise<{ studyId: string; title: string; owner: DemoPerson; consultant: DemoPerson }> {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run the end-to-end tests through `npm test`.');
  const demo = DEMO_STUDIES.find((s) => s.review)!;
  const owner = { name: 'Priya Nair', email: uniqueEmail('priya'), password: STRONG_PASSWORD };
  const consultant = { name: 'Lena Vogel', email: uniqueEmail('lena'), password: STRONG_PASSWORD };
  const db = createDb(url, { max: 1 });
  try {
    const hash = await bcrypt.hash(STRONG_PASSWORD, 10);
    const studyId = await db.transaction().execute(async (trx) => {
      const ids = new Map<string, string>();
      for (const [demoEmail, person] of [
        [PRIYA, owner],
        [LENA, consultant],
      ] as const) {
        const u = await insertUser(trx, { name: person.name, email: person.email, emailVerified: new Date() });
        await setPasswordHash(trx, u.id, hash);
        ids.set(demoEmail, u.id);
      }
      const ws = await insertWorkspace(trx, { name: `${DEMO_WORKSPACE} (${owner.email.split('@')[0]})`, createdBy: ids.get(PRIYA)! });
      await upsertWorkspaceMember(trx, ws.id, ids.get(PRIYA)!, 'admin');
      await upsertWorkspaceMember(trx, ws.id, ids.get(LENA)!, 'member');
      await insertDemoStudy(trx, ws.id, ids.get(PRIYA)!, demo, ids);
      const s = await trx.selectFrom('studies').select('id').where('workspace_id', '=', ws.id).executeTakeFirstOrThrow();
      return s.id;
    });
    return { studyId, title: demo.title, owner, consultant };
  } finally {
    await db.destroy();
  }
}
