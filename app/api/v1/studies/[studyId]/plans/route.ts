import { api, parseBody } from '@/lib/api/handler';
import { planResultDto as dto } from '@/lib/api/dto';
import { listPlanResults, savePlanResult } from '@/lib/data/plans';
import { planResultSaveSchema } from '@/lib/validation/plans';
import { studyParamsSchema } from '@/lib/validation/params';

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
