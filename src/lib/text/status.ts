/**
 * The words for stored status codes: a loop revision's review status and a review request's
 * state. Every screen, mail and export shows these, never the code (`in-review`).
 */
export type LoopStatusCode = 'draft' | 'in-review' | 'approved' | 'changes-requested';
export type RequestStatusCode = 'pending' | 'approved' | 'changes-requested' | 'superseded';

export const LOOP_STATUS_WORDS: Record<LoopStatusCode, string> = {
	draft: 'draft',
	'in-review': 'in review',
	approved: 'approved',
	'changes-requested': 'changes requested'
};

export const REQUEST_STATUS_WORDS: Record<RequestStatusCode, string> = {
	pending: 'waiting',
	approved: 'approved',
	'changes-requested': 'changes requested',
	superseded: 'superseded'
};

/** A loop status in words; an unknown code is shown with its hyphens as spaces rather than raw. */
export function loopStatusText(status: string | null | undefined): string {
	if (!status) return '–';
	return LOOP_STATUS_WORDS[status as LoopStatusCode] ?? status.replace(/-/g, ' ');
}

export function requestStatusText(status: string | null | undefined): string {
	if (!status) return '–';
	return REQUEST_STATUS_WORDS[status as RequestStatusCode] ?? status.replace(/-/g, ' ');
}
