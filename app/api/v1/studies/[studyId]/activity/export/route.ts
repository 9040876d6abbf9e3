import { api, parseQuery } from '@/lib/api/handler';
import { exportActivityCsv } from '@/lib/data/activity';
import { activityExportQuerySchema } from '@/lib/validation/activity';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ req, actor, params }) => {
    const { page: _page, ...filters } = parseQuery(req, activityExportQuerySchema);
    const { filename, csv } = await exportActivityCsv(actor, params.studyId, filters);
    return new Response(csv, {
      headers: {
        'content-type': 'text/csv; charset=utf-8; header=present',
        'content-disposition': `attachment; filename="${filename}"`,
        'cache-control': 'no-store',
      },
    });
  },
  { params: studyParamsSchema },
);
