// The permission matrix written out by hand from the role descriptions (README.md, "The demo"), checked
// against the table the server uses, plus the rejection of better-auth's built-in role names.
import { describe, expect, it } from 'vitest';
import { ACTIONS, can, isRole, matrixRows, PERMISSIONS, ROLES, type Action } from '../../../src/lib/authz';
import { roles as betterAuthRoles } from '../../../src/lib/server/authz/better-auth-roles';

// [project rule, README.md "The demo"] owner: everything; engineer: create/edit projects, rails, loops,
// templates, bench data, request review; reviewer: read, comment, approve or request changes;
// viewer: read only. Our choices inside that: deleting a whole board is for owners; the
// audit trail is readable by every member.
const expected: Record<Action, string> = {
	'workspace.read': 'owner engineer reviewer viewer',
	'workspace.update': 'owner',
	'workspace.delete': 'owner',
	'member.read': 'owner engineer reviewer viewer',
	'member.invite': 'owner',
	'member.updateRole': 'owner',
	'member.remove': 'owner',
	'project.read': 'owner engineer reviewer viewer',
	'project.create': 'owner engineer',
	'project.update': 'owner engineer',
	'project.delete': 'owner',
	'rail.read': 'owner engineer reviewer viewer',
	'rail.create': 'owner engineer',
	'rail.update': 'owner engineer',
	'rail.delete': 'owner engineer',
	'loop.read': 'owner engineer reviewer viewer',
	'loop.save': 'owner engineer',
	'loop.requestReview': 'owner engineer',
	'loop.approve': 'owner reviewer',
	'loop.requestChanges': 'owner reviewer',
	'loop.comment': 'owner engineer reviewer',
	// [project rule] running the switching check and keeping it with a revision is part of designing and of reviewing.
	'loop.check': 'owner engineer reviewer',
	'template.read': 'owner engineer reviewer viewer',
	'template.create': 'owner engineer',
	'template.update': 'owner engineer',
	'template.delete': 'owner engineer',
	'bench.upload': 'owner engineer',
	'audit.read': 'owner engineer reviewer viewer',
	// [project rule] owners see and revoke the API tokens bound to their workspace, whoever's they are.
	'token.manage': 'owner'
};

describe('permission matrix', () => {
	it('lists exactly our four roles', () => {
		expect([...ROLES]).toEqual(['owner', 'engineer', 'reviewer', 'viewer']);
	});

	for (const action of ACTIONS) {
		it(`${action}: ${expected[action]}`, () => {
			expect(ROLES.filter((role) => can(role, action)).join(' ')).toBe(expected[action]);
		});
	}

	it('has a hand-written row for every action and no extra rows', () => {
		expect(Object.keys(expected).sort()).toEqual([...ACTIONS].sort());
		expect(matrixRows().map((r) => r.action)).toEqual([...ACTIONS]);
	});

	it('gives the viewer nothing but reads, and the reviewer no design edits', () => {
		expect([...PERMISSIONS.viewer].every((a) => a.endsWith('.read'))).toBe(true);
		for (const a of ['project.update', 'rail.update', 'loop.save', 'template.update'] as const) expect(can('reviewer', a)).toBe(false);
		expect(can('engineer', 'loop.approve')).toBe(false);
	});

	it("grants nothing to better-auth's built-in names, to lists of roles or to junk", () => {
		for (const name of ['member', 'admin', 'owner,engineer', 'Owner', '', null, undefined]) {
			expect(isRole(name)).toBe(false);
			for (const action of ACTIONS) expect(can(name, action)).toBe(false);
		}
	});

	it('builds better-auth roles that let only owners invite and manage members', () => {
		const invite = (role: keyof typeof betterAuthRoles) => betterAuthRoles[role].authorize({ invitation: ['create'] }).success;
		expect(invite('owner')).toBe(true);
		expect(invite('engineer')).toBe(false);
		expect(invite('reviewer')).toBe(false);
		expect(invite('viewer')).toBe(false);
		expect(betterAuthRoles.reviewer.authorize({ 'lw-loop': ['approve'] }).success).toBe(true);
		expect(betterAuthRoles.engineer.authorize({ 'lw-loop': ['approve'] }).success).toBe(false);
	});
});
