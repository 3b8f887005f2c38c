// zod schemas for the team workspace entities, shared by API routes, form actions and the
// browser. Numbers are SI (V, A, Hz); margins in deg and dB as named. Each entity has one
// base object; create/update variants derive from it.
import { z } from 'zod';

export const ROLE_NAMES = ['owner', 'engineer', 'reviewer', 'viewer'] as const;
export const roleSchema = z.enum(ROLE_NAMES, { error: `role must be one of ${ROLE_NAMES.join(', ')}` });

export const topologySchema = z.enum(['buck', 'boost']);

const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite().positive(`${what} must be > 0`);

/** The margin targets and their defaults have one definition, the engine's (a design document's `targets` use it too). */
import { marginTargetsSchema, DEFAULT_MARGIN_TARGETS } from '../engine/contract/targetsSchema';
export { marginTargetsSchema, DEFAULT_MARGIN_TARGETS };

export const tolerancesSchema = z.object({
	inductorPct: z.number().finite().min(0).max(60).default(20),
	capacitorPct: z.number().finite().min(0).max(80).default(20),
	esrPct: z.number().finite().min(0).max(300).default(50),
	vrefPct: z.number().finite().min(0).max(10).default(1)
});

export const projectSchema = z.object({
	name: z.string().trim().min(1, 'name is required').max(120),
	description: z.string().trim().max(2000).nullable().optional()
});
export const projectCreateSchema = projectSchema;
export const projectUpdateSchema = projectSchema.partial().refine((v) => Object.keys(v).length > 0, 'send at least one field');

/** Rail names as on a schematic net: capitals, digits and underscores (5V0_MAIN, VDD_1V2). */
export const RAIL_NAME = /^[A-Z0-9][A-Z0-9_]{0,63}$/;

const railObject = z.object({
	name: z.string().trim().regex(RAIL_NAME, 'use capitals, digits and _ (like 5V0_MAIN), at most 64'),
	topology: topologySchema,
	vout: positive('vout'),
	vinNom: positive('vinNom'),
	vinMin: positive('vinMin'),
	vinMax: positive('vinMax'),
	ioutNom: positive('ioutNom'),
	ioutMin: positive('ioutMin'),
	ioutMax: positive('ioutMax'),
	fsw: positive('fsw'),
	tolerances: tolerancesSchema.default({ inductorPct: 20, capacitorPct: 20, esrPct: 50, vrefPct: 1 }),
	marginTargets: marginTargetsSchema.nullable().default(null),
	notes: z.string().max(4000).nullable().optional()
});
export type RailInput = z.infer<typeof railObject>;

/** Cross-field rules of a rail, reported on the field that breaks them. */
function checkRail(rail: RailInput, ctx: z.RefinementCtx) {
	const issue = (path: keyof RailInput, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
	if (rail.vinMin > rail.vinNom) issue('vinMin', 'must be ≤ vinNom');
	if (rail.vinMax < rail.vinNom) issue('vinMax', 'must be ≥ vinNom');
	if (rail.ioutMin > rail.ioutNom) issue('ioutMin', 'must be ≤ ioutNom');
	if (rail.ioutMax < rail.ioutNom) issue('ioutMax', 'must be ≥ ioutNom');
	// A buck only steps down and a boost only steps up, at every input corner.
	if (rail.topology === 'buck' && rail.vinMin <= rail.vout) issue('vinMin', 'a buck needs vinMin > vout');
	if (rail.topology === 'boost' && rail.vinMax >= rail.vout) issue('vinMax', 'a boost needs vinMax < vout');
}

export const railSchema = railObject.superRefine(checkRail);
export const railCreateSchema = railSchema;
/** A PATCH body; the service merges it with the stored rail and validates the result with railSchema. */
export const railUpdateSchema = railObject
	.partial()
	.extend({ tolerances: tolerancesSchema.partial().optional() })
	.refine((v) => Object.keys(v).length > 0, 'send at least one field');

export const LOOP_STATUS_NAMES = ['draft', 'in-review', 'approved', 'changes-requested'] as const;

export const loopSaveSchema = z.object({
	/** The revision the edit started from; null (or 0) for the first one. */
	baseRevision: z.number().int().min(0).nullable(),
	design: z.unknown().refine((v) => v !== undefined, 'design is required'),
	message: z.string().trim().min(1, 'say what changed').max(500)
});

export const REVIEW_ACTIONS = ['request-review', 'approve', 'request-changes'] as const;
export const loopReviewSchema = z
	.object({
		action: z.enum(REVIEW_ACTIONS),
		comment: z.string().trim().max(5000).optional(),
		/** request-review: the members asked to sign off (each gets an e-mail and a queue entry). */
		reviewerIds: z.array(z.string().min(1).max(36)).min(1, 'name at least one reviewer').max(10, 'at most 10 reviewers').optional()
	})
	.superRefine((v, ctx) => {
		// Sending a loop back without saying why leaves the author guessing.
		if (v.action === 'request-changes' && !v.comment) ctx.addIssue({ code: 'custom', path: ['comment'], message: 'say what must change' });
		if (v.reviewerIds && v.action !== 'request-review') ctx.addIssue({ code: 'custom', path: ['reviewerIds'], message: 'only with request-review' });
	});

/** GET /api/v1/loops/{id}/report?part=: the database part of the review (`record`), the drawing from the analysis pool (`drawing`), or both (absent). */
export const reportQuerySchema = z.object({ part: z.enum(['record', 'drawing'], { message: 'part is record or drawing' }).optional() });

export const commentSchema = z.object({
	body: z.string().trim().min(1, 'write something').max(5000),
	/** Pins the comment to a frequency on the plot, Hz. */
	freqHz: z.number().finite().positive('must be > 0 Hz').max(1e10).nullable().optional()
});

const compensatorStrategy = z.object({
	kind: z.enum(['type1', 'type2', 'type3', 'type2-ota']),
	/**
	 * The control method of the plant the strategy was placed against (absent in templates made
	 * before peak current mode: voltage). A strategy only fits a rail with the same method.
	 */
	control: z.enum(['voltage', 'peak-current'], { error: 'must be "voltage" or "peak-current"' }).optional(),
	target: z
		.object({
			method: z.enum(['k-factor', 'features', 'manual']),
			crossoverHz: z.number().finite().positive().optional(),
			/** Crossover as a fraction of fsw, for templates that scale with the rail. */
			crossoverFraction: z.number().finite().positive().max(0.5).optional(),
			phaseMarginDeg: z.number().finite().min(0).max(120).optional(),
			/** Zeros as multiples of the rail's LC resonance f0 (placement method "features"). */
			zerosRelF0: z.array(z.number().finite().positive().max(100)).max(2).optional(),
			/** Poles as fractions of the rail's fsw (placement method "features"). */
			polesRelFsw: z.array(z.number().finite().positive().max(10)).max(2).optional()
		})
		.optional(),
	series: z
		.object({
			resistors: z.enum(['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192']).nullable(),
			capacitors: z.enum(['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192']).nullable()
		})
		.optional()
});

export const templateSchema = z.object({
	name: z.string().trim().min(1, 'name is required').max(120),
	description: z.string().trim().max(4000).nullable().optional(),
	topology: topologySchema.nullable().default(null),
	compensator: compensatorStrategy
});
/**
 * An edit names the version it was made on, `baseUpdatedAt` (the template's updatedAt as read), like a loop
 * save names its base revision: an edit on a version someone else has since changed is refused with 409.
 */
export const templateUpdateSchema = templateSchema
	.partial()
	.extend({ baseUpdatedAt: z.iso.datetime({ message: 'send the updatedAt of the template as you read it (ISO 8601)' }) })
	.refine((v) => Object.keys(v).some((k) => k !== 'baseUpdatedAt'), 'send at least one field');

export const workspaceCreateSchema = z.object({
	name: z.string().trim().min(1).max(120),
	slug: z
		.string()
		.trim()
		.regex(/^[a-z0-9][a-z0-9-]{1,62}$/, 'lower-case letters, digits and -, 2 to 63 characters')
});
export const workspaceUpdateSchema = z
	.object({ name: z.string().trim().min(1).max(120), marginTargets: marginTargetsSchema })
	.partial()
	.refine((v) => Object.keys(v).length > 0, 'send at least one field');

export const invitationSchema = z.object({ email: z.email(), role: roleSchema });
export const memberRoleSchema = z.object({ role: roleSchema });
export const TOKEN_MAX_DAYS = 366;
export const tokenCreateSchema = z.object({
	name: z.string().trim().min(1, 'name the token (what uses it)').max(100, 'at most 100 characters'),
	expiresInDays: z
		.number({ error: 'days must be a whole number' })
		.int('days must be a whole number')
		.min(1, 'at least 1 day')
		.max(TOKEN_MAX_DAYS, `at most ${TOKEN_MAX_DAYS} days`)
		.nullable()
		.optional(),
	/** The one workspace the token may act in; omitted or null: every workspace of its user. */
	workspaceId: z.string().min(1).max(36).nullable().optional()
});

/** GET /api/v1/home: every workspace of the caller, or the one named. */
export const homeQuerySchema = z.object({ workspace: z.string().min(1, 'name a workspace id').max(36, 'a workspace id has at most 36 characters').optional() });
