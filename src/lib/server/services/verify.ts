// The one place the server turns a design document into its verdict (engine/verify). Saves,
// template use, the data migration and `npm run reverify` all come through here. With an owner
// (the user or template the work is for) it runs in the analysis pool, off the request thread
// and within its budgets; without one (operator scripts: reverify, the migration's data step)
// it runs in the calling process.
import { verifyDesign } from '../../engine/verify/verifyDesign';
import type { ContractError } from '../../engine/contract/errors';
import type { Verification } from '../../engine/verify/types';
import * as analyses from '../analysis-pool';

export async function verifyDocument(doc: unknown, owner: string | null = null): Promise<Verification | ContractError> {
	return owner === null ? verifyDesign(doc) : analyses.verify(owner, doc);
}
