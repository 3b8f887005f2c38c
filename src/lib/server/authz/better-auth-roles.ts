// Builds better-auth's organization access control from our permission table, so the
// plugin's own endpoints (invite, change role, remove member) obey the same matrix as our API.
// Statements are our dotted actions grouped by entity, plus the plugin's default statements.
import { createAccessControl } from 'better-auth/plugins/access';
import { defaultStatements, ownerAc } from 'better-auth/plugins/organization/access';
import { ACTIONS, PERMISSIONS, ROLES, type Action, type Role } from '../../authz';

type StatementMap = Record<string, string[]>;

function group(actions: Iterable<Action>): StatementMap {
	const out: StatementMap = {};
	for (const action of actions) {
		const [entity, verb] = action.split('.');
		(out[entity] ??= []).push(verb);
	}
	return out;
}

// The plugin checks `member:*`, `invitation:*` and `organization:*` on its endpoints; our
// `member.*` verbs live under a separate key so the two vocabularies never mix.
const ours = Object.fromEntries(Object.entries(group(ACTIONS)).map(([k, v]) => [`lw-${k}`, v]));
export const ac = createAccessControl({ ...defaultStatements, ...ours } as Record<string, readonly string[]>);

function roleStatements(role: Role): StatementMap {
	const mine = Object.fromEntries(Object.entries(group(PERMISSIONS[role])).map(([k, v]) => [`lw-${k}`, v]));
	// Only owners manage the workspace, its members and invitations (and teams, unused here).
	return role === 'owner' ? { ...(ownerAc.statements as unknown as StatementMap), ...mine } : mine;
}

export const roles = Object.fromEntries(ROLES.map((r) => [r, ac.newRole(roleStatements(r))])) as Record<
	Role,
	ReturnType<typeof ac.newRole>
>;
