// Board health: one rail's row read from the stored verdict of its latest saved loop (engine
// verify, computed at save): worst PM, GM and the crossover with the corner that sets each,
// the spread yield, and the verdict. Nothing is judged here; the text is verdictFigures'.
import type { BoardLoop } from '$lib/client/types';
import type { ChipStatus } from '$lib/components/table/status';
import type { VerdictRow } from '$lib/engine/verify/types';
import { verdictFigures, type VerdictFigures } from '$lib/verdict/figures';

export interface Judged {
	value: number | null;
	/** The same figure as text (verdictFigures). */
	text: string;
	/** The corner that sets it ("Vin max, Iout min"), null when no corner has the value. */
	corner: string | null;
	status: ChipStatus;
	reason: string;
}

export interface RailHealth {
	fc: Judged;
	pm: Judged;
	gm: Judged;
	yield: Judged;
	overall: ChipStatus;
	/** The verdict's one-sentence summary. */
	summary: string;
	figures: VerdictFigures | null;
}

const none = (reason: string): Judged => ({ value: null, text: '–', corner: null, status: 'none', reason });

function judged(row: VerdictRow | undefined, value: number | null, text: string, corner: string | null): Judged {
	if (!row) return { value, text, corner, status: 'none', reason: '' };
	return { value, text, corner, status: row.status, reason: row.reason };
}

export function railHealth(loop: BoardLoop | null): RailHealth {
	if (!loop) {
		const n = none('no saved loop yet');
		return { fc: n, pm: n, gm: n, yield: n, overall: 'none', summary: 'No saved loop yet: open the rail to design one.', figures: null };
	}
	const v = loop.verification;
	if (!v) {
		const n = none('not verified yet');
		return { fc: n, pm: n, gm: n, yield: n, overall: 'none', summary: 'This revision has no stored verdict yet (run npm run reverify).', figures: null };
	}
	const f = verdictFigures(v);
	const row = (m: VerdictRow['metric']) => v.rows.find((r) => r.metric === m);
	return {
		fc: judged(row('fc'), v.worst.crossoverHighHz?.value ?? null, f.fc, f.fcCorner),
		pm: judged(row('pm'), v.worst.phaseMarginDeg?.value ?? null, f.pm, f.pmCorner),
		gm: judged(row('gm'), v.worst.gainMarginDb?.value ?? null, f.gm, f.gmCorner),
		yield: judged(row('yield'), v.spread?.yield ?? null, f.yield, null),
		overall: v.status,
		summary: f.summary,
		figures: f
	};
}
