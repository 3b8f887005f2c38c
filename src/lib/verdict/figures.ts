/**
 * The headline figures of a stored verdict as people read them: worst PM, worst GM, the
 * crossover range, the spread yield and pass / caution / fail, each with the corner that sets
 * it. The design screen, the board table, the review page, the PDF and the API all print these
 * strings, so the same verdict reads the same everywhere (row values: the engine's verdictValueText).
 */
import type { Verification, VerdictRow, VerdictStatus } from '../engine/verify/types';
import { verdictValueText } from '../engine/verify/text';
import { formatEng } from '../units/format';
import { withShortCorners } from './cornerList';

export interface VerdictFigures {
	status: VerdictStatus;
	summary: string;
	/** Lowest phase margin over every corner, e.g. "47.2°". */
	pm: string;
	pmCorner: string | null;
	/** Lowest gain margin, e.g. "8.5 dB"; "–" when the phase never reaches −180°. */
	gm: string;
	gmCorner: string | null;
	/** The crossover the verdict judges: the highest (the one the fsw limits bind), e.g. "16.2 kHz". */
	fc: string;
	fcCorner: string | null;
	/** Lowest crossover. */
	fcLow: string;
	fcLowCorner: string | null;
	/** Spread yield at the targets, e.g. "98.4%"; "–" without a spread section. */
	yield: string;
	/** "of 500 samples, seed 1" or "". */
	yieldOf: string;
	/** Number of corners checked. */
	corners: number;
}

/**
 * The part of a stored verdict its headline figures read: what the board table carries per rail
 * (no corner list, warnings or parts, which are most of its size).
 */
export type VerdictHeadline = Pick<Verification, 'engineVersion' | 'status' | 'summary' | 'rows' | 'targets' | 'worst' | 'spread'> & {
	corners: Omit<Verification['corners'], 'list'>;
};

export function verdictFigures(v: VerdictHeadline): VerdictFigures {
	const w = v.worst;
	// The headline texts are the verdict rows' values as every verdict table prints them.
	const text = (metric: VerdictRow['metric']) => {
		const row = v.rows.find((r) => r.metric === metric);
		return row ? verdictValueText(row) : '–';
	};
	return {
		status: v.status,
		// On screen the summary names its corner briefly; the full names are in the rows below it.
		summary: withShortCorners(v.summary, v.rows.map((r) => r.corner)),
		pm: text('pm'),
		pmCorner: w.phaseMarginDeg?.corner ?? null,
		gm: text('gm'),
		gmCorner: w.gainMarginDb?.corner ?? null,
		fc: text('fc'),
		fcCorner: v.rows.find((r) => r.metric === 'fc')?.corner ?? null,
		fcLow: formatEng(w.crossoverLowHz?.value, 'Hz'),
		fcLowCorner: w.crossoverLowHz?.corner ?? null,
		yield: v.spread ? text('yield') : '–',
		yieldOf: v.spread ? `of ${v.spread.samples} samples, seed ${v.spread.seed}` : '',
		corners: v.corners.count
	};
}

/** "PM 47.2° · GM 8.5 dB · fc 16.2 kHz · yield 98.4% · caution": one line for exports and tests. */
export function verdictLine(f: VerdictFigures): string {
	return `PM ${f.pm} · GM ${f.gm} · fc ${f.fc} · yield ${f.yield} · ${f.status}`;
}
