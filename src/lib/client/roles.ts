// What the pages offer each role. The API decides (src/lib/server/authz/permissions.ts, which
// the browser cannot import); this mirror only hides controls a role could not use, and a unit
// test keeps it in step with the server's table.

export type UiAction = 'project.create' | 'project.update' | 'project.delete' | 'rail.create' | 'rail.update' | 'rail.delete' | 'member.invite';

const ALLOWED: Record<string, readonly UiAction[]> = {
	owner: ['project.create', 'project.update', 'project.delete', 'rail.create', 'rail.update', 'rail.delete', 'member.invite'],
	engineer: ['project.create', 'project.update', 'rail.create', 'rail.update', 'rail.delete'],
	reviewer: [],
	viewer: []
};

export const UI_ACTIONS: readonly UiAction[] = ALLOWED.owner;

export function allows(role: string | null | undefined, action: UiAction): boolean {
	return !!role && (ALLOWED[role] ?? []).includes(action);
}
