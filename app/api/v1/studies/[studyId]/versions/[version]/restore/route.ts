import { api } from '@/lib/api/handler';
import { restoreVersion } from '@/lib/data/versions';
import { versionParamsSchema } from '@/lib/validation/params';

export const POST = api(async ({ actor, params }) => restoreVersion(actor, params.studyId, Number(params.version)), { params: versionParamsSchema, status: 201 });
