// The demo sign-ins, shared by the seed (which creates them) and `npm start` (which prints them
// once the server is built). Demo data only: never reuse the password anywhere real.
// Run directly (npx tsx scripts/demo-users.ts) to print the sign-in list.

/** The owner of the demo workspace: the sign-in `npm start` shows first. */
export const DEMO_EMAIL = 'demo@loopwright.local';
/** Shared by every demo user. */
export const DEMO_PASSWORD = 'loopwright-demo';
export const DEMO_USERS = [
	{ role: 'owner', email: DEMO_EMAIL, name: 'Dana Okafor' },
	{ role: 'engineer', email: 'engineer@loopwright.local', name: 'Ilse Marchetti' },
	{ role: 'reviewer', email: 'reviewer@loopwright.local', name: 'Tomasz Lind' },
	{ role: 'viewer', email: 'viewer@loopwright.local', name: 'Priya Raman' }
] as const;

if (import.meta.url === `file://${process.argv[1]}`) {
	console.log(`demo sign-in (password for every demo user: ${DEMO_PASSWORD}):`);
	for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(9)} ${u.email}  (${u.name})`);
}
