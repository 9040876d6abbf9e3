/**
 * The path parameters of /api/v1: every id in an address is a UUID. An address whose id is not
 * one names nothing, so `parseParams` answers 404 (the same as an id that does not exist or is
 * not visible to the caller), with the field that is wrong.
 */
import { z } from 'zod';

const pathId = (thing: string) => z.uuid({ error: `${thing} was not found: the address does not hold a valid id (a UUID).` });

export const studyParamsSchema = z.object({ studyId: pathId('The study') });
export const studyMemberParamsSchema = studyParamsSchema.extend({ userId: pathId('That member') });
export const workspaceParamsSchema = z.object({ workspaceId: pathId('The workspace') });
export const workspaceMemberParamsSchema = workspaceParamsSchema.extend({ userId: pathId('That member') });
export const invitationParamsSchema = z.object({ invitationId: pathId('The invitation') });
export const simulationParamsSchema = z.object({ simulationId: pathId('The stress test') });
export const threadParamsSchema = studyParamsSchema.extend({ threadId: pathId('The thread') });
export const suggestionParamsSchema = studyParamsSchema.extend({ suggestionId: pathId('The suggestion') });

/** A version is named in an address by its number within the study (1, 2, …); read it with Number(). */
const versionNumber = z.string().regex(/^[1-9][0-9]{0,8}$/, { error: 'That version was not found: the address does not hold a version number.' });
export const versionParamsSchema = studyParamsSchema.extend({ version: versionNumber });
export const signoffParamsSchema = studyParamsSchema.extend({ signoffId: pathId('That sign-off') });
