import { api, parseBody } from '@/lib/api/handler';
import { getVersion, nameVersion } from '@/lib/data/versions';
import { versionParamsSchema } from '@/lib/validation/params';
import { versionNameSchema } from '@/lib/validation/versions';

export const GET = api(async ({ actor, params }) => getVersion(actor, params.studyId, Number(params.version)), { params: versionParamsSchema });

export const PATCH = api(
  async ({ req, actor, params }) => nameVersion(actor, params.studyId, Number(params.version), await parseBody(req, versionNameSchema)),
  { params: versionParamsSchema },
);
