import { api, parseQuery } from '@/lib/api/handler';
import { compareStudyVersions } from '@/lib/data/versions';
import { studyParamsSchema } from '@/lib/validation/params';
import { versionCompareQuerySchema } from '@/lib/validation/versions';

export const GET = api(
  async ({ req, actor, params }) => {
    const { from, to } = parseQuery(req, versionCompareQuerySchema);
    return compareStudyVersions(actor, params.studyId, from, to);
  },
  { params: studyParamsSchema },
);
