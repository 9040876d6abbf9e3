/**
 * The OpenAPI 3.1 document of /api/v1, generated (@asteasolutions/zod-to-openapi) from the same
 * zod schemas that validate the requests and that type the code building the answers
 * (./dto.ts, ./simulations.ts, the engine's calculation result). Every route handler under
 * app/api/v1 has an entry here; tests/integration/openapi.test.ts checks that the two lists
 * agree, and the integration suite checks every 2xx answer against the schema named here for
 * its route, method and status (tests/support/api-contract.ts).
 */
import { OpenAPIRegistry, OpenApiGeneratorV31, type RouteConfig } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { studyCreateSchema, studyListQuerySchema, studyUpdateSchema } from '@/lib/validation/study';
import { memberRoleUpdateSchema, studyInvitationCreateSchema } from '@/lib/validation/member';
import {
  invitationAcceptSchema,
  workspaceCreateSchema,
  workspaceInvitationCreateSchema,
  workspaceMemberRoleUpdateSchema,
} from '@/lib/validation/workspace';
import { checkRunSchema, designSaveSchema, findingNoteSchema } from '@/lib/validation/design';
import { planResultSaveSchema } from '@/lib/validation/plans';
import { calculationSchema } from '@/lib/stats/calculations/request';
import { calculationOutputSchema } from '@/lib/stats/calculations/types';
import { runCalculation } from './calculations';
import { CALCULATION_EXAMPLES } from './calculation-examples';
import {
  activityPageSchema,
  checkResultSchema,
  designSavedSchema,
  designStateSchema,
  errorSchema,
  findingNoteDtoSchema,
  healthDegradedSchema,
  healthSchema,
  invitationAcceptedSchema,
  invitationDtoSchema,
  list,
  planResultDtoSchema,
  simulationSpecDerivedSchema,
  studyDtoSchema,
  studyMemberDtoSchema,
  studyPageSchema,
  unsubscribedSchema,
  workspaceDtoSchema,
  workspaceMemberDtoSchema,
} from './dto';
import { simulationDtoSchema } from './simulations';
import { suggestionDtoSchema, threadDtoSchema } from './review';
import {
  replyCreateSchema,
  suggestionAcceptSchema,
  suggestionCreateSchema,
  suggestionDeclineSchema,
  suggestionListQuerySchema,
  threadCreateSchema,
  threadListQuerySchema,
  threadResolveSchema,
} from '@/lib/validation/review';
import { ACTIVITY_PAGE_SIZE, activityExportQuerySchema, activityQuerySchema } from '@/lib/validation/activity';
import { notificationSettingsSchema, notificationSettingsUpdateSchema, unsubscribeParamsSchema } from '@/lib/validation/notifications';
import { simulationRunSchema, simulationSpecQuerySchema } from '@/lib/validation/simulation-run';
import {
  invitationParamsSchema,
  signoffParamsSchema,
  simulationParamsSchema,
  studyMemberParamsSchema,
  suggestionParamsSchema,
  threadParamsSchema,
  studyParamsSchema as studyParams,
  versionParamsSchema,
  workspaceMemberParamsSchema,
  workspaceParamsSchema as workspaceParams,
} from '@/lib/validation/params';
import { signoffCreateSchema, signoffWithdrawSchema, versionCompareQuerySchema, versionNameSchema } from '@/lib/validation/versions';
import { comparisonSchema, signoffDtoSchema, signoffListSchema, versionClosedSchema, versionDetailSchema, versionDtoSchema, versionListSchema } from './versions';

const json = <T extends z.ZodType>(schema: T, description: string) => ({ description, content: { 'application/json': { schema } } });
const err = (description: string) => json(errorSchema, description);

const standardErrors = {
  401: err('Not signed in.'),
  403: err('Signed in, but the role does not allow this; or a cross-site write.'),
  404: err('Not found, or not visible to you (another workspace, or a study you are not a member of).'),
};
const writeErrors = { ...standardErrors, 400: err('Invalid input: see error.fields.'), 409: err('Conflicts with the current state.'), 429: err('Rate limited.') };

/** Per kind, the example request and the answer the engine gives for it (computed here, never by hand). */
function calculationExamples() {
  const requests: Record<string, { summary: string; value: unknown }> = {};
  const responses: Record<string, { summary: string; value: unknown }> = {};
  for (const [kind, example] of Object.entries(CALCULATION_EXAMPLES)) {
    requests[kind] = { summary: example.summary, value: example.request };
    responses[kind] = { summary: example.summary, value: runCalculation(calculationSchema.parse(example.request)) };
  }
  return { requests, responses };
}

function calculationRoute(): RouteConfig {
  const examples = calculationExamples();
  return {
    method: 'post',
    path: '/api/v1/calculations',
    summary: 'Sample size, power or smallest detectable effect for a design (no sign-in)',
    description: [
      'Send the kind and its inputs, leaving out exactly one of the quantities the kind can solve for (or name it in solveFor):',
      'two-group-means, repeated-measures, longitudinal-slopes and two-proportions solve for power, nPerGroup or the effect (delta, slopeDifference, p2);',
      'regression for power, n or f2; cluster-means for power, clustersPerArm, clusterSize or delta. design-effect solves nothing;',
      'optimal-allocation returns the cluster size that minimises cost, then the clusters a budget buys or the budget a target needs.',
      'Sizes are rounded up to whole units and the achieved power is reported. Results are planning estimates, not guarantees.',
      'No sign-in is needed. Calls are limited per signed-in user, per network behind a trusted proxy, or else in one allowance shared by all callers who are not signed in (429 with Retry-After). Browsers on other sites are refused (403); call it from a server or script.',
    ].join(' '),
    security: [],
    request: { body: { content: { 'application/json': { schema: calculationSchema, examples: examples.requests } } } },
    responses: {
      200: { description: 'The solved value with every input, the method, the formula in words, references and warnings', content: { 'application/json': { schema: calculationOutputSchema, examples: examples.responses } } },
      400: err('Invalid input, or not exactly one unknown: see error.fields.'),
      403: err('A cross-site request from a browser.'),
      413: err('The request body is too large.'),
      429: err('Too many calculations from this caller; see Retry-After.'),
    },
  };
}

export const API_ROUTES: RouteConfig[] = [
  calculationRoute(),
  {
    method: 'get',
    path: '/api/v1/workspaces',
    summary: 'Workspaces the signed-in user belongs to',
    responses: { 200: json(list(workspaceDtoSchema), 'Workspaces with your role'), 401: standardErrors[401] },
  },
  {
    method: 'post',
    path: '/api/v1/workspaces',
    summary: 'Create a workspace (you become its admin)',
    request: { body: { content: { 'application/json': { schema: workspaceCreateSchema } } } },
    responses: { 201: json(workspaceDtoSchema, 'The new workspace'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/workspaces/{workspaceId}/members',
    summary: 'Members of a workspace',
    request: { params: workspaceParams },
    responses: { 200: json(list(workspaceMemberDtoSchema), 'Members'), ...standardErrors },
  },
  {
    method: 'patch',
    path: '/api/v1/workspaces/{workspaceId}/members/{userId}',
    summary: 'Change a workspace member’s role (admins)',
    request: {
      params: workspaceMemberParamsSchema,
      body: { content: { 'application/json': { schema: workspaceMemberRoleUpdateSchema } } },
    },
    responses: { 200: json(list(workspaceMemberDtoSchema), 'Members after the change'), ...writeErrors },
  },
  {
    method: 'delete',
    path: '/api/v1/workspaces/{workspaceId}/members/{userId}',
    summary: 'Remove a member from a workspace (admins)',
    request: { params: workspaceMemberParamsSchema },
    responses: { 204: { description: 'Removed' }, ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/workspaces/{workspaceId}/invitations',
    summary: 'Invitations to a workspace (admins)',
    request: { params: workspaceParams },
    responses: { 200: json(list(invitationDtoSchema), 'Invitations'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/workspaces/{workspaceId}/invitations',
    summary: 'Invite someone to a workspace by e-mail (admins)',
    request: { params: workspaceParams, body: { content: { 'application/json': { schema: workspaceInvitationCreateSchema } } } },
    responses: { 201: json(invitationDtoSchema, 'The invitation; the link goes by e-mail only'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies',
    summary: 'Studies of a workspace that you are a member of',
    request: { query: studyListQuerySchema },
    responses: {
      200: json(studyPageSchema, 'One page of studies'),
      400: err('Invalid query'),
      ...standardErrors,
    },
  },
  {
    method: 'post',
    path: '/api/v1/studies',
    summary: 'Create a study (you become its owner)',
    request: { body: { content: { 'application/json': { schema: studyCreateSchema } } } },
    responses: { 201: json(studyDtoSchema, 'The new study'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}',
    summary: 'Read a study',
    request: { params: studyParams },
    responses: { 200: json(studyDtoSchema, 'The study with your role'), ...standardErrors },
  },
  {
    method: 'patch',
    path: '/api/v1/studies/{studyId}',
    summary: 'Update a study’s title or description (owner, editor)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: studyUpdateSchema } } } },
    responses: { 200: json(studyDtoSchema, 'The updated study'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/archive',
    summary: 'Archive a study (owner)',
    request: { params: studyParams },
    responses: { 200: json(studyDtoSchema, 'The archived study'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/restore',
    summary: 'Restore an archived study (owner)',
    request: { params: studyParams },
    responses: { 200: json(studyDtoSchema, 'The restored study'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/members',
    summary: 'Members of a study with their roles',
    request: { params: studyParams },
    responses: { 200: json(list(studyMemberDtoSchema), 'Members'), ...standardErrors },
  },
  {
    method: 'patch',
    path: '/api/v1/studies/{studyId}/members/{userId}',
    summary: 'Change a member’s role (owner)',
    request: {
      params: studyMemberParamsSchema,
      body: { content: { 'application/json': { schema: memberRoleUpdateSchema } } },
    },
    responses: { 200: json(list(studyMemberDtoSchema), 'Members after the change'), ...writeErrors },
  },
  {
    method: 'delete',
    path: '/api/v1/studies/{studyId}/members/{userId}',
    summary: 'Remove a member from a study (owner)',
    request: { params: studyMemberParamsSchema },
    responses: { 204: { description: 'Removed' }, ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/invitations',
    summary: 'Invitations to a study (owner)',
    request: { params: studyParams },
    responses: { 200: json(list(invitationDtoSchema), 'Invitations'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/invitations',
    summary: 'Invite someone to a study with a role (owner)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: studyInvitationCreateSchema } } } },
    responses: { 201: json(invitationDtoSchema, 'The invitation; the link goes by e-mail only'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/activity',
    summary: 'A study’s activity log, newest first, filtered by kind of event, person and days (every member)',
    description: `Pages of ${ACTIVITY_PAGE_SIZE} entries. from and to are whole days in UTC, both included. Each entry says what happened in words (summary).`,
    request: { params: studyParams, query: activityQuerySchema },
    responses: { 200: json(activityPageSchema, 'One page of entries'), 400: err('Invalid query'), ...standardErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/activity/export',
    summary: 'The activity log as a CSV file, with the same filters (every member; the download is itself logged)',
    description:
      'RFC 4180: comma-separated, CRLF line ends, a header row. A cell that would start with = + - or @ starts with an apostrophe instead, so that a spreadsheet does not read typed text as a formula.',
    request: { params: studyParams, query: activityExportQuerySchema },
    responses: {
      200: { description: 'The CSV file (attachment)', content: { 'text/csv': { schema: z.string() } } },
      400: err('Invalid query'),
      ...standardErrors,
    },
  },
  // Notifications by e-mail.
  {
    method: 'get',
    path: '/api/v1/me/notification-settings',
    summary: 'How you get each kind of review notification: at once, in a daily digest, or none',
    responses: { 200: json(notificationSettingsSchema, 'Your settings (defaults where you chose nothing)'), 401: err('Not signed in.') },
  },
  {
    method: 'put',
    path: '/api/v1/me/notification-settings',
    summary: 'Change how you get some kinds of notification (the kinds left out stay as they are)',
    request: { body: { content: { 'application/json': { schema: notificationSettingsUpdateSchema } } } },
    responses: {
      200: json(notificationSettingsSchema, 'Your settings after the change'),
      400: err('Invalid body'),
      401: err('Not signed in.'),
      403: err('Cross-site request.'),
    },
  },
  {
    method: 'post',
    path: '/api/v1/unsubscribe/{token}',
    summary: 'One-click unsubscribe (RFC 8058) with the token of a notification e-mail; no sign-in',
    description:
      'The address in the List-Unsubscribe header of every notification e-mail. Sets the kind the token names (or, for a digest’s token, every kind received in the digest) to none. Doing it again changes nothing. A token changed by a single character is refused (404).',
    security: [],
    request: { params: unsubscribeParamsSchema },
    responses: { 200: json(unsubscribedSchema, 'Unsubscribed'), 404: err('Not a valid unsubscribe link.'), 403: err('Cross-site request from a browser.') },
  },
  {
    method: 'get',
    path: '/api/v1/unsubscribe/{token}',
    summary: 'Sends a browser that opens a one-click address to the confirmation page',
    security: [],
    request: { params: unsubscribeParamsSchema },
    responses: { 303: { description: 'To /unsubscribe/{token}, which asks before changing anything' } },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/design',
    summary: 'The newest revision of the study’s design',
    request: { params: studyParams },
    responses: { 200: json(designStateSchema, 'Revision number, design, who saved it and when'), ...standardErrors },
  },
  {
    method: 'put',
    path: '/api/v1/studies/{studyId}/design',
    summary: 'Save the design as a new revision (owner, editor)',
    description:
      'Send the revision your edit started from as baseRevision. If someone saved meanwhile and changed other parts of the design, your parts are merged onto theirs (merged: true); if they changed the same part, the answer is 409 and nothing is saved.',
    request: { params: studyParams, body: { content: { 'application/json': { schema: designSaveSchema } } } },
    responses: { 200: json(designSavedSchema, 'The new revision'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/checks',
    summary: 'Run the design checks on the saved design, or on a design sent in the body (nothing is saved)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: checkRunSchema } } } },
    responses: { 200: json(checkResultSchema, 'Findings, newest recommendation'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/finding-notes',
    summary: 'History of findings marked addressed or reopened, newest first',
    request: { params: studyParams },
    responses: { 200: json(list(findingNoteDtoSchema), 'Notes'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/finding-notes',
    summary: 'Mark a finding addressed (with a reason) or reopen it (owner, editor, consultant)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: findingNoteSchema } } } },
    responses: { 201: json(list(findingNoteDtoSchema), 'Notes after the change'), ...writeErrors },
  },
  // Plan tab: results saved to a study.
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/plans',
    summary: 'Calculations saved to the study from the Plan tab, newest first',
    request: { params: studyParams },
    responses: { 200: json(list(planResultDtoSchema), 'Saved results, each with the design revision it was computed from'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/plans',
    summary: 'Save a calculation with the study’s current design revision (owner, editor)',
    description:
      'The server runs the calculation from the request and stores its own result. Send the revision the result was computed from; if the design was saved again since, the answer is 409 and nothing is saved.',
    request: { params: studyParams, body: { content: { 'application/json': { schema: planResultSaveSchema } } } },
    responses: { 201: json(planResultDtoSchema, 'The saved result'), ...writeErrors },
  },
  {
    method: 'delete',
    path: '/api/v1/invitations/{invitationId}',
    summary: 'Revoke a pending invitation (workspace admins; study owner for study invitations)',
    request: { params: invitationParamsSchema },
    responses: { 204: { description: 'Revoked' }, ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/invitations/{invitationId}/resend',
    summary: 'Send a pending invitation again with a new link (as for revoking)',
    description:
      'For an invitation whose e-mail failed, or that the invited person cannot find. The old link stops working and the new one expires 7 days from now. Refused (409) while the e-mail is still being sent.',
    request: { params: invitationParamsSchema },
    responses: { 200: json(invitationDtoSchema, 'The invitation; the new link goes by e-mail only'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/invitations/accept',
    summary: 'Accept an invitation with the token from its e-mail (the invited address only)',
    request: { body: { content: { 'application/json': { schema: invitationAcceptSchema } } } },
    responses: {
      200: json(invitationAcceptedSchema, 'Joined'),
      410: err('Expired, revoked or already used.'),
      ...writeErrors,
    },
  },
  // Stress tests: Monte Carlo runs queued as chunks and computed by workers.
  {
    method: 'post',
    path: '/api/v1/simulations',
    summary: 'Start a stress test from a compact specification, or from a study’s design (owner, editor, consultant)',
    description:
      'Send {"spec": {…}} for a run of your own, or {"studyId", "revision"?, "spec"?, "replicates"?, "seed"?} for a run on a study (from the specification sent, else from the design of the revision, newest by default). The run is queued and computed in chunks; poll GET /api/v1/simulations/{simulationId} for progress and results. At most a few runs per person may be queued or running at once (429 otherwise).',
    request: { body: { content: { 'application/json': { schema: simulationRunSchema } } } },
    responses: { 202: json(simulationDtoSchema, 'The queued run'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/simulations/{simulationId}',
    summary: 'A stress test: status, progress and, when done, results and summary',
    request: { params: simulationParamsSchema },
    responses: { 200: json(simulationDtoSchema, 'The run'), ...standardErrors },
  },
  {
    method: 'delete',
    path: '/api/v1/simulations/{simulationId}',
    summary: 'Cancel a queued or running stress test (its creator; on a study: owner, editor, consultant)',
    request: { params: simulationParamsSchema },
    responses: { 200: json(simulationDtoSchema, 'The run, cancelled (or as it was, if it had already ended)'), ...writeErrors },
  },
  // Review: versions (one person's continuous editing), their comparison, sign-offs.
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/versions',
    summary: 'Versions of the design, newest first, with the study’s review state',
    request: { params: studyParams },
    responses: { 200: json(versionListSchema, 'Versions'), ...standardErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/versions/compare',
    summary: 'Two versions side by side: changed fields, findings, the Plan’s size and power, stress-test verdicts',
    request: { params: studyParams, query: versionCompareQuerySchema },
    responses: { 200: json(comparisonSchema, 'The comparison'), ...standardErrors, 400: err('Invalid input: see error.fields.') },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/versions/close',
    summary: 'Close your open version (the wizard calls this when you leave it; owner, editor)',
    request: { params: studyParams },
    responses: { 200: json(versionClosedSchema, 'Whether a version was closed'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/versions/{version}',
    summary: 'One version: its design and its saves',
    request: { params: versionParamsSchema },
    responses: { 200: json(versionDetailSchema, 'The version'), ...standardErrors },
  },
  {
    method: 'patch',
    path: '/api/v1/studies/{studyId}/versions/{version}',
    summary: 'Name a version, or clear its name (owner, editor, consultant); naming the open version closes it',
    request: { params: versionParamsSchema, body: { content: { 'application/json': { schema: versionNameSchema } } } },
    responses: { 200: json(versionDtoSchema, 'The version'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/versions/{version}/restore',
    summary: 'Restore a version: a new version with its design (owner, editor)',
    request: { params: versionParamsSchema },
    responses: { 201: json(versionDtoSchema, 'The new version'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/signoffs',
    summary: 'Sign-offs, newest first, withdrawn ones included, with the study’s review state',
    request: { params: studyParams },
    responses: { 200: json(signoffListSchema, 'Sign-offs'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/signoffs',
    summary: 'Sign off a named version with a statement of what was reviewed (consultant)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: signoffCreateSchema } } } },
    responses: { 201: json(signoffDtoSchema, 'The sign-off'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/signoffs/{signoffId}/withdraw',
    summary: 'Withdraw a sign-off with a reason (consultant)',
    request: { params: signoffParamsSchema, body: { content: { 'application/json': { schema: signoffWithdrawSchema } } } },
    responses: { 200: json(signoffDtoSchema, 'The sign-off, withdrawn'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/simulations',
    summary: 'Stress tests of a study, newest first (without results)',
    request: { params: studyParams },
    responses: { 200: json(list(simulationDtoSchema), 'Runs, at most 50'), ...standardErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/simulations/spec',
    summary: 'The stress-test specification derived from the study’s design (the newest revision unless one is given)',
    description:
      'spec is null when the design cannot be simulated yet: missing then lists what the design still lacks (each naming the Design step that supplies it), unsupported has one sentence per feature of the design the stress test does not simulate yet.',
    request: { params: studyParams, query: simulationSpecQuerySchema },
    responses: {
      200: json(simulationSpecDerivedSchema, 'The derived specification, or what is missing or not supported'),
      400: err('Invalid query'),
      ...standardErrors,
    },
  },
  // Review: threads of comments and suggestions (issue 12).
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/threads',
    summary: 'Review threads of a study with their comments, most recently active first; filter by anchor kind, anchor, author and state',
    request: { params: studyParams, query: threadListQuerySchema },
    responses: { 200: json(list(threadDtoSchema), 'Threads, at most 500'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/threads',
    summary: 'Start a thread on a step or field of the design, a finding, a saved Plan result or a stress test (owner, editor, consultant, writer)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: threadCreateSchema } } } },
    responses: { 201: json(threadDtoSchema, 'The thread with its first comment'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/threads/{threadId}',
    summary: 'One thread with its comments',
    request: { params: threadParamsSchema },
    responses: { 200: json(threadDtoSchema, 'The thread'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/threads/{threadId}/replies',
    summary: 'Reply in a thread (owner, editor, consultant, writer); a reply to a resolved thread reopens it',
    request: { params: threadParamsSchema, body: { content: { 'application/json': { schema: replyCreateSchema } } } },
    responses: { 201: json(threadDtoSchema, 'The thread with the reply'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/threads/{threadId}/resolve',
    summary: 'Resolve a thread (owner, editor, consultant, or the thread’s author)',
    request: { params: threadParamsSchema, body: { content: { 'application/json': { schema: threadResolveSchema } } } },
    responses: { 200: json(threadDtoSchema, 'The thread, resolved'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/threads/{threadId}/reopen',
    summary: 'Reopen a resolved thread (owner, editor, consultant, or the thread’s author)',
    request: { params: threadParamsSchema },
    responses: { 200: json(threadDtoSchema, 'The thread, open'), ...writeErrors },
  },
  {
    method: 'get',
    path: '/api/v1/studies/{studyId}/suggestions',
    summary: 'Suggested changes to the design, newest first, each with the field’s current value and whether it changed since',
    request: { params: studyParams, query: suggestionListQuerySchema },
    responses: { 200: json(list(suggestionDtoSchema), 'Suggestions, at most 500'), ...standardErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/suggestions',
    summary: 'Suggest a new value for one field of the design, with a reason (owner, editor, consultant)',
    request: { params: studyParams, body: { content: { 'application/json': { schema: suggestionCreateSchema } } } },
    responses: { 201: json(suggestionDtoSchema, 'The pending suggestion'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/suggestions/{suggestionId}/accept',
    summary: 'Accept a suggestion: the design gets a new revision with the suggested value (owner, editor)',
    description: 'When the field changed since the suggestion was made, send its current value in confirmedCurrentValue; otherwise the answer is 409 with both values.',
    request: { params: suggestionParamsSchema, body: { content: { 'application/json': { schema: suggestionAcceptSchema } } } },
    responses: { 200: json(suggestionDtoSchema, 'The accepted suggestion, with the revision it became'), ...writeErrors },
  },
  {
    method: 'post',
    path: '/api/v1/studies/{studyId}/suggestions/{suggestionId}/decline',
    summary: 'Decline a suggestion with a reason (owner, editor)',
    request: { params: suggestionParamsSchema, body: { content: { 'application/json': { schema: suggestionDeclineSchema } } } },
    responses: { 200: json(suggestionDtoSchema, 'The declined suggestion'), ...writeErrors },
  },
];

const WRITE_METHODS = new Set(['post', 'put', 'patch', 'delete']);

/** The Idempotency-Key header of every signed-in write (lib/api/idempotency.ts). */
const idempotencyHeaders = z.object({
  'Idempotency-Key': z
    .string()
    .regex(/^[\x21-\x7e]{1,255}$/)
    .optional()
    .meta({
      example: '3f0c9a52-8c1e-4b8e-9a57-2d6f0e4b1c77',
      description:
        'Optional; 1 to 255 visible characters, a new UUID per write is simplest. A write sent again with the same key (say, because its answer was lost) is carried out once: the repeat gets the first answer again, with the header `Idempotent-Replayed: true`. The same key with another method, path or body is refused with 409. Only successful answers are kept, for 24 hours, per signed-in person.',
    }),
});

/** The health probe: outside /api/v1 and `api()`, public, and in the document like the rest. */
export const HEALTH_ROUTE: RouteConfig = {
  method: 'get',
  path: '/api/health',
  summary: 'Liveness and database reachability',
  security: [],
  responses: {
    200: json(healthSchema, 'Healthy'),
    503: json(healthDegradedSchema, 'Database unreachable'),
  },
};

export function openApiDocument() {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: 'authjs.session-token',
    description: 'The session cookie set by signing in (named __Secure-authjs.session-token over https).',
  });
  for (const route of API_ROUTES) {
    const signedInWrite = WRITE_METHODS.has(route.method) && route.security === undefined;
    const request = signedInWrite ? { ...route.request, headers: idempotencyHeaders } : route.request;
    registry.registerPath({ security: [{ session: [] }], ...route, request });
  }
  registry.registerPath(HEALTH_ROUTE);
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Unitwise API',
      version: '1.0.0',
      description:
        'JSON API of Unitwise. Errors are {"error": {"code", "message", "fields"?}}. Writes from another site are refused. Sign in through the web app; the API uses the same session cookie.',
    },
    servers: [{ url: '/' }],
  });
}
