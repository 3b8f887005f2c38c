/**
 * Closed-loop worker: the closed-loop responses and the load and reference steps of the nominal
 * design (closedLoopOf), off the main thread, started once the input settles so that opening the
 * Closed loop or Step tab only paints. Tens of milliseconds of engine work that would otherwise
 * run on the tab's click or delay the next keystroke.
 */
import { analyzeDesignDetailed } from '$lib/engine';
import { closedLoopOf } from './robustness';
import type { FromClosedLoop, ToClosedLoop } from './closedLoopProtocol';
import { answerEachRequest } from './workerReplies';

answerEachRequest<ToClosedLoop, FromClosedLoop>(({ document, step }) => {
	const nominal = analyzeDesignDetailed(document, { closedLoop: false, sections: false });
	return 'error' in nominal ? { type: 'error', message: nominal.error.message } : { type: 'closed-loop', ...closedLoopOf(nominal, step) };
});
