// The one place the server turns a design document into its verdict (engine/verify). Saves,
// template use, the data migration and `npm run reverify` all come through here, so moving the
// work off the request thread (a worker pool with time and memory budgets) changes one line.
import { verifyDesign } from '../../engine/verify/verifyDesign';
import type { ContractError } from '../../engine/contract/errors';
import type { Verification } from '../../engine/verify/types';

export async function verifyDocument(doc: unknown): Promise<Verification | ContractError> {
	return verifyDesign(doc);
}
