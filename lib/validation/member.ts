import { z } from 'zod';
import { ASSIGNABLE_STUDY_ROLES } from '@/lib/auth/permissions';
import { STUDY_ROLES } from '@/db/schema';
import { emailSchema, idSchema } from './common';

export const memberRoleUpdateSchema = z
  .object({ role: z.enum(ASSIGNABLE_STUDY_ROLES, { error: 'Choose editor, consultant, writer or viewer.' }) })
  .meta({ id: 'MemberRoleUpdate' });
export type MemberRoleUpdateInput = z.infer<typeof memberRoleUpdateSchema>;

export const studyInvitationCreateSchema = z
  .object({
    email: emailSchema,
    role: z.enum(ASSIGNABLE_STUDY_ROLES, { error: 'Choose editor, consultant, writer or viewer.' }),
  })
  .meta({ id: 'StudyInvitationCreate' });
export type StudyInvitationCreateInput = z.infer<typeof studyInvitationCreateSchema>;

export const studyMemberSchema = z
  .object({
    userId: idSchema,
    name: z.string().nullable(),
    email: z.string(),
    role: z.enum(STUDY_ROLES),
    since: z.string(),
  })
  .meta({ id: 'StudyMember' });
