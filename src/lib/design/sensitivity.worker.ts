/**
 * Sensitivity worker: d PM, GM, fc per part (engine/sensitivity, two loop analyses per part) off
 * the main thread, asked for once the input settles and the Corners tab is open, so typing never
 * waits for it.
 */
import { designSensitivity } from '$lib/engine/sensitivity';
import type { FromSensitivity, ToSensitivity } from './sensitivityProtocol';
import { answerEachRequest, validDocument } from './workerReplies';

answerEachRequest<ToSensitivity, FromSensitivity>(({ document }) => {
	const valid = validDocument(document);
	if ('message' in valid) return valid;
	const report = designSensitivity(valid.document);
	return 'error' in report ? { type: 'error', message: report.error.message } : { type: 'sensitivity', report };
});
