import { z } from 'zod';
import { WORKSPACE_ROLES } from '@/db/schema';
import { rawText, text } from '@/lib/text-schema';
import { emailSchema } from './common';

export const workspaceCreateSchema = z
  .object({ name: text('Workspace name', 2, 100).meta({ example: 'Harrow Vale Institute' }) })
  .meta({ id: 'WorkspaceCreate' });
export type WorkspaceCreateInput = z.infer<typeof workspaceCreateSchema>;

export const workspaceInvitationCreateSchema = z
  .object({
    email: emailSchema,
    role: z.enum(WORKSPACE_ROLES, { error: 'Choose admin or member.' }).default('member'),
  })
  .meta({ id: 'WorkspaceInvitationCreate' });
export type WorkspaceInvitationCreateInput = z.infer<typeof workspaceInvitationCreateSchema>;

export const workspaceMemberRoleUpdateSchema = z
  .object({ role: z.enum(WORKSPACE_ROLES, { error: 'Choose admin or member.' }) })
  .meta({ id: 'WorkspaceMemberRoleUpdate' });

export const invitationAcceptSchema = z
  .object({ token: rawText('The invitation link').min(20, 'This invitation link is incomplete.').max(200, 'This invitation link is too long.') })
  .meta({ id: 'InvitationAccept' });
