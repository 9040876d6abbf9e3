import { api, parseQuery } from '@/lib/api/handler';
import { activityDto } from '@/lib/api/dto';
import { listActivity } from '@/lib/data/activity';
import { activityQuerySchema } from '@/lib/validation/activity';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ req, actor, params }) => {
    const page = await listActivity(actor, params.studyId, parseQuery(req, activityQuerySchema));
    return { ...page, items: page.items.map(activityDto) };
  },
  { params: studyParamsSchema },
);
