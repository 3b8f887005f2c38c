// The OpenAPI 3.1 description of /api/v1, generated from the same zod schemas the routes
// validate with (zod's own JSON Schema output) and the roles from the permission table, so
// the document cannot drift from the code. Served at GET /api/v1/openapi.json.
import { z } from 'zod';
import { designDocumentSchema } from '../engine/contract/designSchema';
import {
	commentSchema,
	invitationSchema,
	loopReviewSchema,
	memberRoleSchema,
	projectCreateSchema,
	projectUpdateSchema,
	railCreateSchema,
	railUpdateSchema,
	templateSchema,
	templateUpdateSchema,
	tokenCreateSchema,
	workspaceCreateSchema,
	workspaceUpdateSchema
} from '../schemas/workspace';
import { benchFitSchema, benchUploadJsonSchema, designImportSchema, templateApplySchema, switchingCheckRequestSchema, templateFromLoopSchema } from '../schemas/signoff';
import { passwordChangeSchema, profileSchema, tokenSignInSchema } from '../schemas/auth';
import { ROLES, can, type Action } from '../authz';

interface Operation {
	method: 'get' | 'post' | 'patch' | 'delete';
	path: string;
	summary: string;
	/** The permission checked; absent = any signed-in caller. */
	action?: Action | Action[];
	body?: z.ZodType | 'design';
	/** Collection routes address a workspace with ?workspace= (or x-workspace-id). */
	workspaceQuery?: boolean;
	paged?: boolean;
	success: 200 | 201 | 204;
}

const OPERATIONS: Operation[] = [
	{ method: 'get', path: '/me', summary: 'The caller and their workspaces with the role in each', success: 200 },
	{ method: 'get', path: '/workspaces', summary: "The caller's workspaces", success: 200 },
	{ method: 'post', path: '/workspaces', summary: 'Create a workspace; the caller becomes its owner', body: workspaceCreateSchema, success: 201 },
	{ method: 'get', path: '/workspaces/{id}', summary: 'A workspace with its default margin targets', action: 'workspace.read', success: 200 },
	{ method: 'patch', path: '/workspaces/{id}', summary: 'Rename it or change the default margin targets', action: 'workspace.update', body: workspaceUpdateSchema, success: 200 },
	{ method: 'get', path: '/workspaces/{id}/members', summary: 'Members and their roles', action: 'member.read', success: 200 },
	{ method: 'patch', path: '/workspaces/{id}/members/{memberId}', summary: "Change a member's role (a workspace keeps one owner)", action: 'member.updateRole', body: memberRoleSchema, success: 200 },
	{ method: 'delete', path: '/workspaces/{id}/members/{memberId}', summary: 'Remove a member', action: 'member.remove', success: 204 },
	{ method: 'get', path: '/workspaces/{id}/invitations', summary: 'Invitations and their status (owners)', action: 'member.invite', success: 200 },
	{ method: 'post', path: '/workspaces/{id}/invitations', summary: 'Invite an address with one of our roles; the link goes by e-mail (429 beyond the hourly invitation limits)', action: 'member.invite', body: invitationSchema, success: 201 },
	{ method: 'delete', path: '/workspaces/{id}/invitations/{invitationId}', summary: 'Cancel a pending invitation', action: 'member.invite', success: 204 },
	{ method: 'get', path: '/projects', summary: 'Projects (boards) of the workspace', action: 'project.read', workspaceQuery: true, paged: true, success: 200 },
	{ method: 'post', path: '/projects', summary: 'Create a project', action: 'project.create', workspaceQuery: true, body: projectCreateSchema, success: 201 },
	{ method: 'get', path: '/projects/{id}', summary: 'One project', action: 'project.read', success: 200 },
	{ method: 'patch', path: '/projects/{id}', summary: 'Edit a project', action: 'project.update', body: projectUpdateSchema, success: 200 },
	{ method: 'delete', path: '/projects/{id}', summary: 'Delete a project with its rails and loops', action: 'project.delete', success: 204 },
	{ method: 'get', path: '/projects/{id}/rails', summary: "The board's rails with corners, targets in force and latest revision", action: 'rail.read', paged: true, success: 200 },
	{ method: 'post', path: '/projects/{id}/rails', summary: 'Add a rail', action: 'rail.create', body: railCreateSchema, success: 201 },
	{ method: 'get', path: '/projects/{id}/board', summary: 'The board-health table in one answer: the board, your role, the workspace targets and every rail (up to 1000) with what the table shows: name, topology, operating point, notes, verdict flag, and its latest revision (id, number, review status, stored verdict headline)', action: 'rail.read', success: 200 },
	{ method: 'get', path: '/rails', summary: "Every rail of the workspace with its board's name, by board then rail (up to 1000 per page)", action: 'rail.read', workspaceQuery: true, paged: true, success: 200 },
	{ method: 'get', path: '/rails/{id}', summary: 'One rail', action: 'rail.read', success: 200 },
	{ method: 'get', path: '/rails/{id}/screen', summary: "The rail design screen in one answer: the rail, your role, the latest revision's design (no stored verdict), its revisions (up to 200), the latest revision's review requests and candidates, and the bench files", action: ['rail.read', 'loop.read'], success: 200 },
	{ method: 'patch', path: '/rails/{id}', summary: 'Edit a rail (merged with the stored rail, validated whole)', action: 'rail.update', body: railUpdateSchema, success: 200 },
	{ method: 'delete', path: '/rails/{id}', summary: 'Delete a rail with its loops', action: 'rail.delete', success: 204 },
	{ method: 'delete', path: '/rails/{id}/verdict-flag', summary: "Acknowledge that re-verification changed the verdict of the rail's latest revision (clears `verdictFlag`)", action: 'rail.update', success: 200 },
	{ method: 'get', path: '/rails/{id}/loops', summary: "The rail's loop revisions, newest first (the stored verdict without its corner list, no design)", action: 'loop.read', paged: true, success: 200 },
	{
		method: 'post',
		path: '/rails/{id}/loops',
		summary: "Save the next revision: the design's missing spec sections (targets, corners, tolerances, spread) come from the rail, the engine's verdict is stored with it. 409 stale-revision (with `currentRevision` and `current`) when baseRevision is not the latest",
		action: 'loop.save',
		body: 'design',
		success: 201
	},
	{ method: 'get', path: '/loops/{id}', summary: 'One revision with its design document (spec included) and the verdict stored at save (`verification`, `engineVersion`)', action: 'loop.read', success: 200 },
	{
		method: 'post',
		path: '/loops/{id}/review',
		summary: 'Sign-off step: request-review (draft | changes-requested → in-review), approve or request-changes (in-review → …); 422 otherwise',
		action: ['loop.requestReview', 'loop.approve', 'loop.requestChanges'],
		body: loopReviewSchema,
		success: 200
	},
	{ method: 'get', path: '/loops/{id}/review', summary: 'Sign-off state: the review requests (who, status, when) and the members who may be asked', action: 'loop.read', success: 200 },
	{ method: 'get', path: '/loops/{id}/comments', summary: 'The review conversation', action: 'loop.read', success: 200 },
	{ method: 'post', path: '/loops/{id}/comments', summary: 'Add a comment', action: 'loop.comment', body: commentSchema, success: 201 },
	{ method: 'get', path: '/loops/{id}/report', summary: 'Review view: the stored verdict and its figures, the worst corners, the spec, parts, operating point, closed loop and steps, plot data, review trail, comments, requests and the differences (parameters and verdict) to the previous and the last approved revision; ?part=record (the database part, with your role) or ?part=drawing (the analysis part) answers one half', action: 'loop.read', success: 200 },
	{ method: 'get', path: '/loops/{id}/exports/{format}', summary: 'Download the revision: csv (sweep), verdict (the stored verdict as CSV), svg or png (Bode plot; ?corners=1, ?corner=N, ?theme=dark, ?width=), spice (ngspice netlist; ?batch=1), json (design document with the built parts, the stored verdict and the kept switching check), pdf (sign-off report)', action: 'loop.read', success: 200 },
	{ method: 'get', path: '/loops/{id}/switching-check', summary: 'The switching check kept with the revision (`switchingCheck`: engine version, time, frequencies and the result: PM and fc on the switched circuit beside the averaged ones, the caution and its usual causes), or null', action: 'loop.read', success: 200 },
	{
		method: 'post',
		path: '/loops/{id}/switching-check',
		summary: 'Run the switching check of the stored design in the analysis pool and keep it with the revision (a kept check of the current engine and the same frequencies is answered as it is, `reused`); 400 names a frequency outside fsw/2000 … fsw/2; 422 when the design cannot be checked or the check goes over the budget',
		action: 'loop.check',
		body: switchingCheckRequestSchema,
		success: 200
	},
	{ method: 'post', path: '/loops/{id}/template', summary: "Save the revision's compensator strategy as a template scaled to the plant (fc / fsw, zeros / f0, poles / fsw, series)", action: 'template.create', body: templateFromLoopSchema, success: 201 },
	{ method: 'get', path: '/reviews', summary: "The caller's review queue: revisions they were asked to sign off, then the others waiting in review", action: 'loop.read', workspaceQuery: true, success: 200 },
	{ method: 'post', path: '/rails/{id}/import', summary: 'Import a design JSON file as the next revision (400 invalid-design with fields `document.<path>`; 409 on a stale base)', action: 'loop.save', body: designImportSchema, success: 201 },
	{ method: 'get', path: '/rails/{id}/bench', summary: "The rail's bench files (metadata only), newest first", action: 'rail.read', success: 200 },
	{
		method: 'post',
		path: '/rails/{id}/bench',
		summary: 'Upload a measured loop-gain or plant file (CSV/TSV, at most 5 MB) as multipart/form-data (`file` + metadata fields) or this JSON; parse errors are 400 with line and column in `fields.file` and `issues`',
		action: 'bench.upload',
		body: benchUploadJsonSchema,
		success: 201
	},
	{
		method: 'post',
		path: '/rails/{id}/bench/{benchId}/fit',
		summary: 'Fit the uncertain parameters of a revision (loopId, default the latest) to the bench file: fitted values with 95 % intervals, the residual before and after, and the fitted document; `save: true` (owner, engineer) stores it as the next revision. 400 invalid-fit names the field',
		action: 'rail.read',
		body: benchFitSchema,
		success: 200
	},
	{ method: 'get', path: '/bench/{id}', summary: 'One bench file with its data and overlay on a revision (?loop=, default the latest): measured fc/PM/GM and the model deviation up to fsw/2', action: 'rail.read', success: 200 },
	{ method: 'delete', path: '/bench/{id}', summary: 'Delete a bench file', action: 'bench.upload', success: 204 },
	{ method: 'get', path: '/templates', summary: 'Compensator strategies shared in the workspace (`q`: those whose name, description, topology or network kind contains it), each with the rails whose latest revision uses it', action: 'template.read', workspaceQuery: true, paged: true, success: 200 },
	{ method: 'post', path: '/templates', summary: 'Add a template', action: 'template.create', workspaceQuery: true, body: templateSchema, success: 201 },
	{ method: 'get', path: '/templates/{id}', summary: 'One template', action: 'template.read', success: 200 },
	{ method: 'patch', path: '/templates/{id}', summary: 'Edit a template; a changed strategy re-verifies the rails that use it and flags those whose verdict changes (`reverified`)', action: 'template.update', body: templateUpdateSchema, success: 200 },
	{ method: 'delete', path: '/templates/{id}', summary: 'Delete a template', action: 'template.delete', success: 204 },
	{
		method: 'post',
		path: '/templates/{id}/apply',
		summary: "Place the template's network on a rail's plant and answer the parts and achieved margins at every corner; save: true also saves the rail's next revision",
		action: ['rail.read', 'loop.save'],
		body: templateApplySchema,
		success: 200
	},
	{ method: 'get', path: '/templates/{id}/rails', summary: 'The rails whose latest revision was placed from this template', action: 'template.read', success: 200 },
	{ method: 'get', path: '/audit', summary: 'The audit trail, newest first (?entityId= narrows it to one row)', action: 'audit.read', workspaceQuery: true, paged: true, success: 200 },
	{ method: 'get', path: '/tokens', summary: "The caller's API tokens (never the secrets)", success: 200 },
	{
		method: 'post',
		path: '/tokens',
		summary: 'Create an API token (from a signed-in session, never with another token); the secret is shown once. With `workspaceId` it acts only in that workspace and its owners can revoke it',
		body: tokenCreateSchema,
		success: 201
	},
	{
		method: 'post',
		path: '/tokens/sign-in',
		summary: "A script's first token from e-mail and password (no session needed; the sign-in failure limits apply, 429 beyond them); the secret is shown once",
		body: tokenCreateSchema.extend(tokenSignInSchema.shape),
		success: 201
	},
	{ method: 'delete', path: '/tokens/{id}', summary: 'Revoke one of your tokens', success: 204 },
	{ method: 'get', path: '/workspaces/{id}/tokens', summary: 'The API tokens bound to the workspace, whoever\'s they are (never the secrets)', action: 'token.manage', success: 200 },
	{ method: 'delete', path: '/workspaces/{id}/tokens/{tokenId}', summary: 'Revoke a token bound to the workspace', action: 'token.manage', success: 204 },
	{ method: 'patch', path: '/me', summary: 'Change your display name', body: profileSchema, success: 200 },
	{
		method: 'post',
		path: '/me/password',
		summary: 'Change your password (from a signed-in session); ends your other sessions, `revokeTokens` also revokes your API tokens',
		body: passwordChangeSchema,
		success: 200
	},
	{
		method: 'get',
		path: '/home',
		summary: 'Your pending sign-offs, your rails whose stored verdict is caution or fail, and recent activity (each at most 20), over your workspaces or the one named',
		workspaceQuery: true,
		success: 200
	},
	{ method: 'post', path: '/analyze', summary: 'Stateless analysis of a design document (the body is the document)', body: designDocumentSchema, success: 200 }
];

const jsonSchema = (schema: z.ZodType) => {
	const { $schema: _drop, ...rest } = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
	return rest;
};

const errorBody = {
	type: 'object',
	required: ['error'],
	properties: {
		error: {
			type: 'object',
			required: ['code', 'message'],
			properties: { code: { type: 'string' }, message: { type: 'string' }, fields: { type: 'object', additionalProperties: { type: 'string' } } }
		}
	}
};

function rolesText(action: Operation['action']): string {
	if (!action) return 'Any signed-in caller.';
	const actions = Array.isArray(action) ? action : [action];
	return actions.map((a) => `\`${a}\`: ${ROLES.filter((r) => can(r, a)).join(', ')}`).join('; ') + '.';
}

function operation(op: Operation) {
	const parameters: unknown[] = [...op.path.matchAll(/\{(\w+)\}/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } }));
	if (op.workspaceQuery) parameters.push({ name: 'workspace', in: 'query', required: false, schema: { type: 'string' }, description: 'Workspace id; else the x-workspace-id header, the active workspace, or your only one' });
	if (op.paged) {
		parameters.push({ name: 'limit', in: 'query', schema: { type: 'integer', minimum: 1, maximum: 200, default: 50 } });
		parameters.push({ name: 'offset', in: 'query', schema: { type: 'integer', minimum: 0, default: 0 } });
	}
	const body =
		op.body === 'design'
			? {
					type: 'object',
					required: ['baseRevision', 'design', 'message'],
					properties: {
						baseRevision: { anyOf: [{ type: 'integer', minimum: 0 }, { type: 'null' }], description: 'The revision the edit started from; null or 0 for the first' },
						design: { $ref: '#/components/schemas/DesignDocument' },
						message: { type: 'string', minLength: 1, maxLength: 500 }
					}
				}
			: op.body === designDocumentSchema
				? { $ref: '#/components/schemas/DesignDocument' }
				: op.body
					? jsonSchema(op.body)
					: null;
	const error = (description: string) => ({ description, content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } });
	return {
		summary: op.summary,
		description: `Roles: ${rolesText(op.action)}`,
		parameters,
		...(body ? { requestBody: { required: true, content: { 'application/json': { schema: body } } } } : {}),
		responses: {
			[op.success]: { description: op.success === 204 ? 'Done, no body' : 'OK', ...(op.success === 204 ? {} : { content: { 'application/json': {} } }) },
			400: error('Validation failed; `fields` maps dotted paths to messages'),
			401: error('Signed out: send the session cookie or `Authorization: Bearer lw_…`'),
			...(op.action ? { 403: error('Your role may not do this'), 404: error('No such row in any workspace you belong to') } : {}),
			...(op.method === 'post' || op.method === 'patch' ? { 409: error('Conflict (duplicate name, stale revision)'), 413: error('Body over 1 MB'), 422: error('Not possible in the current state') } : {})
		}
	};
}

export function openApiDocument() {
	const paths: Record<string, Record<string, unknown>> = {};
	for (const op of OPERATIONS) (paths[`/api/v1${op.path}`] ??= {})[op.method] = operation(op);
	return {
		openapi: '3.1.0',
		info: {
			title: 'Loopwright API',
			version: '1',
			description:
				'JSON in and out. Authenticate with the better-auth session cookie (sign in at /api/auth/sign-in/email) or a personal token as `Authorization: Bearer lw_…`. Errors are `{ error: { code, message, fields? } }`. Another workspace’s ids answer 404.'
		},
		paths,
		components: { schemas: { DesignDocument: jsonSchema(designDocumentSchema), Error: errorBody } }
	};
}

/** "METHOD /api/v1/route" for every documented operation, in SvelteKit's [param] spelling. */
export const documentedRoutes = () => OPERATIONS.map((op) => `${op.method.toUpperCase()} /api/v1${op.path.replace(/\{(\w+)\}/g, '[$1]')}`);
