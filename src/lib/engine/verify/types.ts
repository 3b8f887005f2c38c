/**
 * The verdict of a design document (DEVELOPERS.md, "Verdict rules"): one function (verifyDesign.ts) computes it for the
 * browser's live view and for the server, which stores it with the revision. The shape is the
 * contract between the two (see DEVELOPERS.md, "Verdict").
 */
import type { Targets } from '../contract/targetsSchema';

export type VerdictStatus = 'pass' | 'caution' | 'fail';

export interface VerdictRow {
	metric: 'pm' | 'gm' | 'fc' | 'stability' | 'yield' | 'model' | 'current-loop';
	status: VerdictStatus;
	/** The worst value (deg, dB, Hz, fraction), or null when there is none. */
	value: number | null;
	/** e.g. "≥ 45°". */
	target: string;
	/** Label of the corner that sets it, e.g. "Vin max, Iout min, L −20 %". */
	corner: string | null;
	/** Plain words. */
	reason: string;
}

export interface VerifiedCorner {
	label: string;
	vin: number;
	iout: number;
	/** Part temperature, °C (only when the document gives a temperature range). */
	temperatureC?: number;
	factors: Record<string, number>;
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
	closedLoopStable: boolean | null;
	warnings: string[];
	error: string | null;
}

export interface Worst {
	value: number;
	corner: string;
}

export interface Verification {
	/** ENGINE_VERSION (version.ts) the verdict was computed with. */
	engineVersion: string;
	status: VerdictStatus;
	/** One sentence. */
	summary: string;
	rows: VerdictRow[];
	targets: Targets;
	nominal: {
		crossoverHz: number | null;
		phaseMarginDeg: number | null;
		gainMarginDb: number | null;
		closedLoopStable: boolean | null;
		modulusMargin: number | null;
	};
	worst: {
		phaseMarginDeg: Worst | null;
		gainMarginDb: Worst | null;
		crossoverLowHz: Worst | null;
		crossoverHighHz: Worst | null;
	};
	corners: {
		mode: 'exhaustive' | 'one-at-a-time';
		count: number;
		unstable: number;
		failed: number;
		list: VerifiedCorner[];
	};
	/** null when the document has no spread section (or no part has a tolerance). */
	spread: { samples: number; seed: number; yield: number; stable: number } | null;
	/** Every warning raised at any corner (or by the nominal design), with the corners it appeared at. */
	warnings: { code: string; message: string; corners: string[] }[];
	parts: {
		ideal: Record<string, number>;
		rounded: Record<string, number> | null;
		series: { resistors: string | null; capacitors: string | null } | null;
	};
}
