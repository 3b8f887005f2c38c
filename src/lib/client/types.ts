// The JSON shapes the pages read from /api/v1 (dates arrive as ISO strings). Input fields come
// from the shared zod schemas so that a rail here and a rail in the API are one definition.
import type { z } from 'zod';
import type { marginTargetsSchema, RailInput } from '$lib/schemas/workspace';
import type { Verification } from '$lib/engine/verify/types';
import type { VerdictFlag } from '$lib/verdict/flag';
import type { railSpecSections } from '$lib/spec/railSpec';

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

export interface MemberRow {
	id: string;
	userId: string;
	name: string;
	email: string;
	role: string;
	joinedAt: string;
}
