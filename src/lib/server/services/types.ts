// Shapes stored in JSON columns and shared by services, routes and the seed. The input
// shapes come from the zod schemas in $lib/schemas so there is one definition of each.
import type { z } from 'zod';
import type { marginTargetsSchema, tolerancesSchema } from '../../schemas/workspace';
import type { Database } from '../db';

/** Minimum margins a loop must meet; a rail may override its workspace's defaults. */
export type MarginTargets = z.infer<typeof marginTargetsSchema>;

/** Part and input tolerances of a rail, in percent (±). */
export type RailTolerances = z.infer<typeof tolerancesSchema>;

/** The stored verdict and its flag; shared with the browser, so they live in $lib/verdict. */
export type { VerdictFlag, VerdictBrief } from '../../verdict/flag';

/** Who performs a write; recorded in the audit log. */
export interface Actor {
	userId: string;
	email: string;
}

/** The database handle or an open transaction on it. */
export type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0];
