import { api, parseBody } from '@/lib/api/handler';
import { findingNoteDto as dto } from '@/lib/api/dto';
import { addFindingNote, listFindingNotes } from '@/lib/data/designs';
import { findingNoteSchema } from '@/lib/validation/design';
import { studyParamsSchema } from '@/lib/validation/params';

export const GET = api(
  async ({ actor, params }) => ({ items: (await listFindingNotes(actor, params.studyId)).map(dto) }),
  { params: studyParamsSchema },
);

export const POST = api(
  async ({ req, actor, params }) => {
    const input = await parseBody(req, findingNoteSchema);
    return { items: (await addFindingNote(actor, params.studyId, input)).map(dto) };
  },
  { params: studyParamsSchema, status: 201 },
);
