import { api } from '@/lib/api/handler';
import { listStudySimulations } from '@/lib/data/simulations';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({ items: await listStudySimulations(actor, params.studyId) }),
  { params: studyParamsSchema },
);
