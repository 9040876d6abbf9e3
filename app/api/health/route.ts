import { sql } from 'kysely';
import { db } from '@/lib/db';

export const dynamic = 'force-dynamic';

/** 200 when the app and its database answer; 503 while the database is unreachable. */
export async function GET() {
  try {
    await sql`select 1`.execute(db());
    return Response.json({ status: 'ok', database: 'ok' });
  } catch (err) {
    console.error('[health] database check failed:', (err as Error).message);
    return Response.json({ status: 'degraded', database: 'unreachable' }, { status: 503 });
  }
}
