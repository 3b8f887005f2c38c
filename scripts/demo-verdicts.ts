// Prints every stored revision's verdict, rail by rail, in the text every screen shows
// (verdictFigures), for the closing note of a verdict change. With `--before FILE` (a JSON list
// of { rail, revision, verdict, pm, gm, fc, summary } captured under the old rules) each line
// shows old → new. Run after `npm run reverify`: npx tsx scripts/demo-verdicts.ts [--before F]
import { readFileSync } from 'node:fs';
import { asc, eq } from 'drizzle-orm';
import { db, pool } from '../src/lib/server/db';
import { loopRevision, rail } from '../src/lib/server/db/schema';
import { formatDb, formatDeg, formatEng } from '../src/lib/units/format';
import { verdictFigures, verdictLine } from '../src/lib/verdict/figures';

interface Before {
	rail: string;
	revision: number;
	verdict: string;
	pm: number | null;
	gm: number | null;
	fc: number | null;
	summary: string;
	corners: number;
}
const at = process.argv.indexOf('--before');
const before: Before[] = at > 0 ? JSON.parse(readFileSync(process.argv[at + 1], 'utf8')) : [];
try {
	const rows = await db
		.select({ rail: rail.name, revision: loopRevision.revision, status: loopRevision.status, verification: loopRevision.verification })
		.from(loopRevision)
		.innerJoin(rail, eq(rail.id, loopRevision.railId))
		.orderBy(asc(rail.name), asc(loopRevision.revision));
	for (const r of rows) {
		const old = before.find((b) => b.rail === r.rail && b.revision === r.revision);
		const now = r.verification ? verdictFigures(r.verification) : null;
		console.log(`${r.rail} r${r.revision} (${r.status})`);
		if (old) console.log(`  before: ${old.verdict.padEnd(7)} PM ${formatDeg(old.pm)} · GM ${formatDb(old.gm)} · fc ${formatEng(old.fc, 'Hz')} over ${old.corners} corners — ${old.summary}`);
		console.log(`  after:  ${now ? `${now.status.padEnd(7)} ${verdictLine(now)} over ${now.corners} corners — ${now.summary}` : 'no stored verdict'}`);
	}
} finally {
	await pool.end();
}
