import { api, parseBody } from '@/lib/api/handler';
import { studyDto } from '@/lib/api/dto';
import { getStudy, updateStudy } from '@/lib/data/studies';
import { studyUpdateSchema } from '@/lib/validation/study';

type Params = { studyId: string };

export const GET = api<Params>(async ({ actor, params }) => studyDto(await getStudy(actor, params.studyId)));

export const PATCH = api<Params>(async ({ req, actor, params }) => {
  const input = await parseBody(req, studyUpdateSchema);
  return studyDto(await updateStudy(actor, params.studyId, input));
});
