// Exports never answer 500 on text (issue: a revision message `fc 40k -> 60k` made exports/pdf fail
// with a RangeError). Through the API: whatever a user types as their name, a board name, rail notes,
// a revision message or a comment, GET …/exports/pdf, svg and png answer 200 with a well-formed file.
import '../support/env';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { teamWithBoard } from '../support/board';
import { buckDesign } from '../support/designs';
import { pdfProblems, pngProblems, svgProblems } from '../../unit/exports/fileChecks';
import { propertyParams, propertyTimeout } from '../../unit/property/runs';
import { hostileUserText } from '../../unit/property/userText';

const board = teamWithBoard('Export text board');

async function download(path: string) {
	const response = await fetch(board.origin + path, { headers: { cookie: board.team.as.engineer.cookie } });
	return { status: response.status, type: response.headers.get('content-type') ?? '', bytes: Buffer.from(await response.arrayBuffer()) };
}

/** Fields the API trims and requires non-empty: a leading letter keeps every generated text valid. */
const field = (text: string, max: number) => `x ${text}`.slice(0, max);

describe('exports of a revision whose every text field holds what a user typed', () => {
	it(
		'pdf, svg and png answer 200 with well-formed files',
		async () => {
			await fc.assert(
				fc.asyncProperty(fc.record({ author: hostileUserText(), board: hostileUserText(), notes: hostileUserText(120), message: hostileUserText(120), comment: hostileUserText(120) }), async (t) => {
					const engineer = board.team.as.engineer;
					expect((await engineer.post('/api/auth/update-user', { name: field(t.author, 100) })).status).toBe(200);
					expect((await board.team.as.owner.patch(`/api/v1/projects/${board.projectId}`, { name: field(t.board, 120) })).status).toBe(200);
					const rail = await board.newRail('TXT', { notes: t.notes });
					const loopId = (await board.save(rail.id, buckDesign(), { message: field(t.message, 500) })).id;
					expect((await engineer.post(`/api/v1/loops/${loopId}/comments`, { body: field(t.comment, 5000), freqHz: 40_000 })).status).toBe(201);

					const pdf = await download(`/api/v1/loops/${loopId}/exports/pdf`);
					expect(pdf.status, pdf.bytes.toString('utf8').slice(0, 300)).toBe(200);
					expect(pdf.type).toBe('application/pdf');
					expect(pdfProblems(pdf.bytes)).toEqual([]);
					const svg = await download(`/api/v1/loops/${loopId}/exports/svg`);
					expect(svg.status).toBe(200);
					expect(svgProblems(svg.bytes.toString('utf8'))).toEqual([]);
					const png = await download(`/api/v1/loops/${loopId}/exports/png?width=400`);
					expect(png.status, png.bytes.toString('utf8').slice(0, 300)).toBe(200);
					expect(pngProblems(png.bytes)).toEqual([]);
				}),
				propertyParams(4)
			);
		},
		propertyTimeout()
	);

	it('the message from the report, `fc 40k -> 60k`, and its cousins', async () => {
		const rail = await board.newRail('TXT_LIG');
		const saved = await board.save(rail.id, buckDesign(), { message: 'fc 40k -> 60k, >= || ... :: /* <>' });
		const pdf = await download(`/api/v1/loops/${saved.id}/exports/pdf`);
		expect(pdf.status).toBe(200);
		expect(pdfProblems(pdf.bytes)).toEqual([]);
	});
});
