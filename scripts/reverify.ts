// `npm run reverify`: re-verifies the stored revisions whose verdict came from another engine
// version (or has none yet), stores the new verdicts and flags every rail whose latest
// revision's verdict changed. `--all` re-verifies every revision. Prints one line per revision
// (before → after) and a JSON summary with --json. Kept switching checks of another engine
// version are listed, not re-run (each runs when asked for, in the analysis pool). DB_* settings
// as in scripts/env.sh.
import { db, pool } from '../src/lib/server/db';
import { olderChecks } from '../src/lib/server/services/switching-check';
import { reverify } from '../src/lib/server/services/verdicts';

const all = process.argv.includes('--all');
const json = process.argv.includes('--json');
try {
	const entries = await reverify(db, {
		all,
		onEntry: (e) => {
			if (json) return;
			const before = e.before ? e.before.status : 'none';
			const after = e.after ? e.after.status : `error: ${e.error}`;
			console.log(`[reverify] ${e.railName} r${e.revision}: ${before} → ${after}${e.flagged ? '  (rail flagged)' : ''}${e.specFilled ? '  (spec filled from the rail)' : ''}`);
		}
	});
	const olderSwitchingChecks = await olderChecks(db);
	if (json) console.log(JSON.stringify({ reverified: entries, olderSwitchingChecks }, null, 1));
	else {
		console.log(`[reverify] ${entries.length} revision(s) re-verified, ${entries.filter((e) => e.flagged).length} rail(s) flagged`);
		for (const c of olderSwitchingChecks) console.log(`[reverify] ${c.railName} r${c.revision}: switching check of engine ${c.engineVersion}, not re-run (run it again on the review page)`);
		if (olderSwitchingChecks.length) console.log(`[reverify] ${olderSwitchingChecks.length} switching check(s) of an older engine listed, not re-run`);
	}
} catch (error) {
	console.error('[reverify] failed:', error);
	process.exitCode = 1;
} finally {
	await pool.end();
}
