import { api, parseBody, parseQuery } from '@/lib/api/handler';
import { studyDto, type StudyPage } from '@/lib/api/dto';
import { createStudy, listStudies } from '@/lib/data/studies';
import { studyCreateSchema, studyListQuerySchema } from '@/lib/validation/study';

export const GET = api(async ({ req, actor }): Promise<StudyPage> => {
  const query = parseQuery(req, studyListQuerySchema);
  const page = await listStudies(actor, query);
  return { ...page, items: page.items.map(studyDto) };
});

export const POST = api(
  async ({ req, actor }) => {
    const input = await parseBody(req, studyCreateSchema);
    return studyDto(await createStudy(actor, input));
  },
  { status: 201 },
);
