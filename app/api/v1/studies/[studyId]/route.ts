import { api, parseBody } from '@/lib/api/handler';
import { studyDto } from '@/lib/api/dto';
import { getStudy, updateStudy } from '@/lib/data/studies';
import { studyUpdateSchema } from '@/lib/validation/study';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(async ({ actor, params }) => studyDto(await getStudy(actor, params.studyId)), { params: studyParamsSchema });

export const PATCH = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, studyUpdateSchema);
    return studyDto(await updateStudy(actor, params.studyId, input));
  },
  { params: studyParamsSchema },
);
