/** A verdict's status, plus "none" for a rail that has no saved loop to judge. */
export type ChipStatus = 'pass' | 'caution' | 'fail' | 'none';

const RANK: Record<ChipStatus, number> = { none: -1, pass: 0, caution: 1, fail: 2 };

/** The worse of two statuses; "none" only wins over nothing. */
export function worse(a: ChipStatus, b: ChipStatus): ChipStatus {
	return RANK[b] > RANK[a] ? b : a;
}

/** A number for sorting: pass < caution < fail, no loop last (see sortRows). */
export function statusRank(s: ChipStatus): number | null {
	return s === 'none' ? null : RANK[s];
}
