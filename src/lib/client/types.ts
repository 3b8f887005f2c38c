// The JSON shapes the pages read from /api/v1 (dates arrive as ISO strings). Input fields come
// from the shared zod schemas so that a rail here and a rail in the API are one definition.
import type { z } from 'zod';
import type { marginTargetsSchema, RailInput } from '$lib/schemas/workspace';
import type { Verification } from '$lib/engine/verify/types';
import type { VerdictFlag } from '$lib/verdict/flag';
import type { railSpecSections } from '$lib/spec/railSpec';
import type { VerdictHeadline } from '$lib/verdict/figures';

export type MarginTargets = z.infer<typeof marginTargetsSchema>;

export interface WorkspaceSummary {
	id: string;
	name: string;
	slug: string;
	role: string;
}

export interface Me {
	user: { id: string; email: string; name: string };
	activeWorkspaceId: string | null;
	workspaces: WorkspaceSummary[];
}

export interface Project {
	id: string;
	workspaceId: string;
	name: string;
	description: string | null;
	railCount?: number;
	createdAt: string;
	updatedAt: string;
}

export interface Page<T> {
	items: T[];
	page: { limit: number; offset: number; total: number };
}

export type Rail = RailInput & {
	id: string;
	workspaceId: string;
	projectId: string;
	effectiveMarginTargets: MarginTargets;
	latestRevision: number | null;
	/** Set when re-verification changed the verdict of the rail's latest revision. */
	verdictFlag: VerdictFlag | null;
	/** The verification spec a new revision starts from (design-document sections, withRailSpec). */
	spec: ReturnType<typeof railSpecSections>;
	createdAt: string;
	updatedAt: string;
};

export type { Verification, VerdictFlag };

export type LoopStatus = 'draft' | 'in-review' | 'approved' | 'changes-requested';

export interface LoopSummary {
	id: string;
	railId: string;
	revision: number;
	status: LoopStatus;
	message: string;
	/** The verdict stored at save (without its per-corner list in a list answer). */
	verification: Verification | null;
	engineVersion: string | null;
	authorName: string | null;
	createdAt: string;
}

/** The latest revision of a rail on the board: its review status and the stored verdict's headline (services/board.ts). */
export type BoardLoop = Pick<LoopSummary, 'id' | 'revision' | 'status'> & { verification: VerdictHeadline | null };
/** A rail on the board: what the table shows and the rail form edits (no spec sections, tolerances or targets). */
export type BoardRail = Pick<Rail, 'id' | 'name' | 'topology' | 'vout' | 'vinNom' | 'vinMin' | 'vinMax' | 'ioutNom' | 'ioutMin' | 'ioutMax' | 'fsw' | 'notes' | 'verdictFlag' | 'latestRevision'> & {
	latest: BoardLoop | null;
};

/** GET /api/v1/projects/{id}/board: the board-health page in one answer. */
export interface Board {
	project: Project;
	/** The caller's role in the board's workspace (null: a name that is not one of ours). */
	role: string | null;
	/** The workspace's margin targets (defaults for new revisions). */
	targets: MarginTargets;
	rails: BoardRail[];
	total: number;
	truncated: boolean;
}

/** A revision as the rail screen's history lists it (no verdict, no design). */
export type RevisionSummary = Omit<LoopSummary, 'verification'> & { authorId: string | null };

export interface ReviewRequestRow {
	id: string;
	reviewerId: string;
	reviewerName: string;
	status: string;
	note: string | null;
	createdAt: string;
	decidedAt: string | null;
}

/** Who may be asked to sign off a revision (owners and reviewers, not its author). */
export interface ReviewCandidate {
	userId: string;
	name: string;
	email: string;
	role: string;
}

/** A bench file as lists show it (metadata, no measured series). */
export interface BenchFileRow {
	id: string;
	fileName: string;
	kind: string;
	points: number;
	metadata: Record<string, unknown>;
	createdAt: string;
	uploaderName: string | null;
}

/** GET /api/v1/rails/{id}/screen: the rail design screen in one answer. */
export interface RailScreen {
	rail: Rail;
	/** The caller's role in the rail's workspace (null: a name that is not one of ours). */
	role: string | null;
	/** The latest revision with its design document (the stored verdict stays out), or null before the first save. */
	latest: (RevisionSummary & { design: unknown }) | null;
	/** Newest first, up to 200; `total` counts them all. */
	history: { items: RevisionSummary[]; total: number };
	/** The latest revision's review requests and who could be asked; null before the first save. */
	review: { requests: ReviewRequestRow[]; candidates: ReviewCandidate[] } | null;
	bench: { items: BenchFileRow[] };
}

/** Where a template is in use: a rail whose latest revision was placed from it. */
export interface TemplateUse {
	railId: string;
	railName: string;
	projectId: string;
	revision: number;
	status: LoopStatus;
}

/** GET /api/v1/templates items: a shared compensator strategy and the rails using it. */
export interface TemplateRow {
	id: string;
	workspaceId: string;
	name: string;
	description: string | null;
	topology: 'buck' | 'boost' | null;
	compensator: unknown;
	rails: TemplateUse[];
}

/** GET /api/v1/rails items: a rail of the workspace with its board's name. */
export interface WorkspaceRail {
	id: string;
	name: string;
	topology: 'buck' | 'boost';
	fsw: number;
	projectId: string;
	projectName: string;
}

interface QueueEntry {
	loopId: string;
	revision: number;
	status: LoopStatus;
	message: string;
	authorId: string | null;
	authorName: string | null;
	createdAt: string;
	railId: string;
	railName: string;
	projectId: string;
	projectName: string;
}

/** GET /api/v1/reviews: the caller's review queue in one workspace. */
export interface ReviewQueue {
	/** Revisions the caller was asked to sign off, open ones first, with their answer. */
	assigned: (QueueEntry & { requestStatus: string; requestedAt: string; decidedAt: string | null; note: string | null })[];
	/** Every other revision waiting in review. */
	waiting: QueueEntry[];
}

export interface MemberRow {
	id: string;
	userId: string;
	name: string;
	email: string;
	role: string;
	joinedAt: string;
}

export interface InvitationRow {
	id: string;
	email: string;
	role: string;
	status: string;
	expiresAt: string;
	createdAt: string;
}

/** An API token as lists show it (never the secret). */
export interface TokenRow {
	id: string;
	name: string;
	prefix: string;
	/** The one workspace it acts in; null: every workspace of its user. */
	workspaceId: string | null;
	workspaceName: string | null;
	createdAt: string;
	lastUsedAt: string | null;
	expiresAt: string | null;
	revokedAt: string | null;
	/** In an owner's list of the workspace's tokens: whose it is. */
	userName?: string;
	userEmail?: string;
}

/** The answer of POST /api/v1/tokens: the row and, this once, the secret. */
export type CreatedToken = TokenRow & { token: string };

interface HomePlace {
	workspaceId: string;
	workspaceName: string;
	projectId: string;
	projectName: string;
	railId: string;
	railName: string;
	loopId: string;
	revision: number;
}

export interface HomeData {
	workspaceIds: string[];
	pendingReviews: (HomePlace & { requestedAt: string; requestedByName: string | null; note: string | null; message: string })[];
	attentionRails: (HomePlace & { status: 'caution' | 'fail'; summary: string | null; savedAt: string })[];
	activity: (HomePlace & { kind: 'revision' | 'review-requested' | 'approved' | 'changes-requested'; at: string; actorName: string | null; reviewerName: string | null; message: string | null })[];
	limit: number;
}

/** A server value as it arrives in JSON: dates become ISO strings, undefined members drop out of the type's certainty. */
type Json<T> = T extends Date ? string : T extends (infer U)[] ? Json<U>[] : T extends object ? { [K in keyof T]: Json<T[K]> } : T;

/** GET /api/v1/loops/{id}/report?part=record: the review page's database part (services/signoff.reviewRecord) with the caller's role. */
export type ReviewRecord = Json<Awaited<ReturnType<typeof import('$lib/server/services/signoff').reviewRecord>>> & { role: string | null };
/** GET /api/v1/loops/{id}/report?part=drawing: the stored design drawn again in the analysis pool, or `analysisError`; or the API's refusal of the request in the same shape. */
export type ReviewDrawing = Json<Awaited<ReturnType<typeof import('$lib/server/services/signoff').reviewDrawing>>> | ReviewDrawingRefused;
export interface ReviewDrawingRefused {
	analysisError: { code: string; message: string };
	plot: null;
	operatingPoint: null;
	modulator: null;
	network: null;
	closedLoop: null;
	steps: null;
	sensitivity: null;
}
