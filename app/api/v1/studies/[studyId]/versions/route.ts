import { api } from '@/lib/api/handler';
import { listVersions } from '@/lib/data/versions';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(async ({ actor, params }) => listVersions(actor, params.studyId), { params: studyParamsSchema });
