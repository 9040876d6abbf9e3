import { api, parseBody } from '@/lib/api/handler';
import { listPlanResults, savePlanResult, type SavedPlanResult } from '@/lib/data/plans';
import { planResultSaveSchema } from '@/lib/validation/plans';

type Params = { studyId: string };

const dto = (r: SavedPlanResult) => ({ ...r, createdAt: r.createdAt.toISOString() });

export const GET = api<Params>(async ({ actor, params }) => ({ items: (await listPlanResults(actor, params.studyId)).map(dto) }));

export const POST = api<Params>(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, planResultSaveSchema);
    return dto(await savePlanResult(actor, params.studyId, input));
  },
  { status: 201 },
);
