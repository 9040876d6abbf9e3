import { api, parseBody } from '@/lib/api/handler';
import { listPlanResults, savePlanResult, type SavedPlanResult } from '@/lib/data/plans';
import { planResultSaveSchema } from '@/lib/validation/plans';
import { studyParamsSchema } from '@/lib/validation/params';

const dto = (r: SavedPlanResult) => ({ ...r, createdAt: r.createdAt.toISOString() });

export const GET = api(
  async ({ actor, params }) => ({ items: (await listPlanResults(actor, params.studyId)).map(dto) }),
  { params: studyParamsSchema },
);

export const POST = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, planResultSaveSchema);
    return dto(await savePlanResult(actor, params.studyId, input));
  },
  { params: studyParamsSchema, status: 201 },
);
