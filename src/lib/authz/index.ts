// The workspace permission matrix: which of our four roles may do which action. Pure data and
// pure functions, no imports, so both sides use this one table: the server's guard
// ($lib/server/authz/guard.ts, which every API route calls) decides with it, and pages ask
// `can(role, action)` to hide controls a role could not use. better-auth's organization roles
// are built from this same table.

/** Our role names, strongest first. better-auth's built-in names (admin, member) are not roles here. */
export const ROLES = ['owner', 'engineer', 'reviewer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

/** Every action a workspace member can attempt. Dotted: `<entity>.<verb>`. */
export const ACTIONS = [
	'workspace.read',
	'workspace.update',
	'workspace.delete',
	'member.read',
	'member.invite',
	'member.updateRole',
	'member.remove',
	'project.read',
	'project.create',
	'project.update',
	'project.delete',
	'rail.read',
	'rail.create',
	'rail.update',
	'rail.delete',
	'loop.read',
	'loop.save',
	'loop.requestReview',
	'loop.approve',
	'loop.requestChanges',
	'loop.comment',
	'loop.check',
	'template.read',
	'template.create',
	'template.update',
	'template.delete',
	'bench.upload',
	'audit.read',
	'token.manage'
] as const;
export type Action = (typeof ACTIONS)[number];

/** Each action in the words an error message or a hint uses ("may not approve a loop"). */
export const ACTION_WORDS: Readonly<Record<Action, string>> = {
	'workspace.read': 'open this workspace',
	'workspace.update': 'change the workspace settings',
	'workspace.delete': 'delete the workspace',
	'member.read': 'see the members',
	'member.invite': 'invite members',
	'member.updateRole': "change members' roles",
	'member.remove': 'remove members',
	'project.read': 'open boards',
	'project.create': 'add boards',
	'project.update': 'edit boards',
	'project.delete': 'delete boards',
	'rail.read': 'open rails',
	'rail.create': 'add rails',
	'rail.update': 'edit rails',
	'rail.delete': 'delete rails',
	'loop.read': 'open loop revisions',
	'loop.save': 'save loop revisions',
	'loop.requestReview': 'ask for a review',
	'loop.approve': 'approve a loop',
	'loop.requestChanges': 'send a loop back for changes',
	'loop.comment': 'comment on a loop',
	'loop.check': 'run a switching check on a revision',
	'template.read': 'see templates',
	'template.create': 'save templates',
	'template.update': 'edit templates',
	'template.delete': 'delete templates',
	'bench.upload': 'upload bench data',
	'audit.read': 'read the audit log',
	'token.manage': 'manage API tokens and the workspace administration'
};

const READ: Action[] = ACTIONS.filter((a) => a.endsWith('.read'));

/** Design work: everything an engineer edits (projects, rails, loops, templates, bench data). */
const DESIGN_WRITE: Action[] = [
	'project.create',
	'project.update',
	'rail.create',
	'rail.update',
	'rail.delete',
	'loop.save',
	'loop.requestReview',
	'loop.comment',
	'loop.check',
	'template.create',
	'template.update',
	'template.delete',
	'bench.upload'
];

/** Sign-off: a reviewer reads everything, comments, approves or sends a loop back. */
const REVIEW: Action[] = ['loop.approve', 'loop.requestChanges', 'loop.comment', 'loop.check'];

/**
 * The matrix as implemented. Owner: everything, including members, roles and deleting a board.
 * Engineer: design work, no sign-off, no member management, cannot delete a whole board.
 * Reviewer: read everything plus sign-off and comments; cannot edit designs.
 * Viewer: read only.
 */
export const PERMISSIONS: Readonly<Record<Role, ReadonlySet<Action>>> = {
	owner: new Set<Action>(ACTIONS),
	engineer: new Set<Action>([...READ, ...DESIGN_WRITE]),
	reviewer: new Set<Action>([...READ, ...REVIEW]),
	viewer: new Set<Action>(READ)
};

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

/** True when `role` may perform `action`. Unknown role strings (e.g. the plugin's `member`) may do nothing. */
export function can(role: string | null | undefined, action: Action): boolean {
	return isRole(role) && PERMISSIONS[role].has(action);
}

/** The matrix as rows for documentation and tests: one row per action with the roles allowed. */
export function matrixRows(): { action: Action; roles: Role[] }[] {
	return ACTIONS.map((action) => ({ action, roles: ROLES.filter((r) => PERMISSIONS[r].has(action)) }));
}
