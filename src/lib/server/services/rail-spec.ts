// A rail's defaults for the verification spec of its revisions: its Vin/Iout ranges, part
// tolerances and the margin targets in force (the rail's own, else its workspace's), turned
// into design-document sections by the pure withRailSpec ($lib/spec/railSpec, shared with the
// browser's live view).
import type { Database } from '../db';
import { withRailSpec, type RailSpecSource } from '../../spec/railSpec';
import type { Rail } from './rails';
import * as workspaces from './workspaces';

export { withRailSpec };

export async function specSource(db: Database, rail: Rail): Promise<RailSpecSource> {
	const targets = rail.marginTargets ?? (await workspaces.marginTargets(db, rail.workspaceId));
	return { vinMin: rail.vinMin, vinMax: rail.vinMax, ioutMin: rail.ioutMin, ioutMax: rail.ioutMax, tolerances: rail.tolerances, targets };
}

/** `doc` with every spec section it lacks taken from `rail`. */
export async function completeSpec(db: Database, rail: Rail, doc: Record<string, unknown>) {
	return withRailSpec(doc, await specSource(db, rail));
}
