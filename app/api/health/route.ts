import { sql } from 'kysely';
import type { z } from 'zod';
import type { healthDegradedSchema, healthSchema } from '@/lib/api/dto';
import { db } from '@/lib/db';
import { isDatabaseUnavailable } from '@/lib/errors';
import { logger } from '@/lib/log';

export const dynamic = 'force-dynamic';

const log = logger('health');

/**
 * 200 when the app and its database answer; 503 while the database is unreachable. A monitor
 * polls this every few seconds, so an outage is logged once when it begins and once when it ends
 * (db/availability.ts, through the pool), not at every probe.
 */
export async function GET() {
  try {
    await sql`select 1`.execute(db());
    return Response.json({ status: 'ok', database: 'ok' } satisfies z.output<typeof healthSchema>);
  } catch (err) {
    if (!isDatabaseUnavailable(err)) log.error('database check failed', err);
    return Response.json({ status: 'degraded', database: 'unreachable' } satisfies z.output<typeof healthDegradedSchema>, { status: 503 });
  }
}
