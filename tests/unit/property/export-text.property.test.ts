// Exports never fail on text: whatever a user types into a rail, board, author, reviewer, comment or
// note field, the sign-off PDF, the plot SVG and the plot PNG come out as well-formed files
// (tests/unit/exports/fileChecks.ts), and every character the PDF draws has a glyph in the face it is
// drawn in (the rest were replaced by U+FFFD on purpose). Before the fix, `fc 40k -> 60k` in a comment
// threw RangeError inside fontkit (the ligature's empty spacer glyph) and a control character made the
// SVG unparsable, so the PNG export failed.
import { readFileSync } from 'node:fs';
import { create, type Font } from 'fontkit';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeDesign, type AnalysisResponse } from '$lib/engine';
import { verifyDesign } from '$lib/engine/verify/verifyDesign';
import { buildSignoffPdf, plotFromResponse, renderBodePng, renderBodeSvg, svgToPng } from '$lib/server/exports';
import { drawableText, REPLACEMENT } from '$lib/server/exports/drawableText';
import { dejaVuSansTtf, jetBrainsMonoTtf, notoEmojiTtf } from '$lib/server/exports/fonts';
import { fontFor, type TextStyle } from '$lib/server/exports/pdfFonts';
import { pdfProblems, pngProblems, svgProblems } from '../exports/fileChecks';
import { propertyParams, propertyTimeout } from './runs';
import { userText } from './userText';

const designDoc = JSON.parse(readFileSync('reference/cases/buck-ceramic-1v2.json', 'utf8'));
const analysed = analyzeDesign(designDoc);
if ('error' in analysed) throw new Error(analysed.error.message);
const response: AnalysisResponse = analysed;
// The engine's verdict of the same design, so the report's verdict section is drawn too.
const verified = verifyDesign(designDoc);
if ('error' in verified) throw new Error(verified.error.message);
const plot = plotFromResponse(response, { fswHz: designDoc.plant.fsw });
// A small plot image for the PDF runs: the text is under test here, not the image (pdfkit spends about
// a second splitting a full-size plot's alpha channel).
const smallPlot = svgToPng('<svg xmlns="http://www.w3.org/2000/svg" width="40" height="24"><rect width="40" height="24" fill="#eee"/></svg>');

const unescapeXml = (s: string) => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&amp;/g, '&');

describe('text a user typed, in every export format', () => {
	it(
		'the sign-off PDF is a well-formed file whatever the rail, board, notes, author, reviewer and comment say',
		async () => {
			await fc.assert(
				fc.asyncProperty(
					fc.record({ rail: userText(), board: userText(), notes: userText(120), author: userText(), who: userText(), note: userText(120) }),
					async (t) => {
						const pdf = await buildSignoffPdf({
							rail: { name: t.rail, board: t.board, notes: t.notes },
							revision: { label: 'r2', author: t.author, createdAt: '2026-12-01T10:00:00Z' },
							document: designDoc,
							response,
							verification: verified,
							review: [
								{ at: '2026-12-01T11:00:00Z', who: t.who, action: 'saved', note: t.note },
								{ at: '2026-12-01T12:00:00Z', who: t.author, action: 'commented', note: t.rail, freqHz: 40_000 }
							],
							plotPng: smallPlot,
							generatedAt: new Date('2026-12-02T09:00:00Z')
						});
						expect(pdfProblems(pdf)).toEqual([]);
					}
				),
				propertyParams(25)
			);
		},
		propertyTimeout()
	);

	it(
		'the plot SVG parses as XML and its title says what was typed (forbidden characters shown as U+FFFD)',
		() => {
			fc.assert(
				fc.property(userText(), (title) => {
					const svg = renderBodeSvg({ ...plot, title });
					expect(svgProblems(svg)).toEqual([]);
					expect(unescapeXml(/<title>([^<]*)<\/title>/.exec(svg)![1])).toBe(drawableText(title));
				}),
				propertyParams(200)
			);
		},
		propertyTimeout()
	);

	it(
		'the plot PNG is a well-formed image whatever the title',
		() => {
			fc.assert(
				fc.property(userText(), (title) => {
					expect(pngProblems(renderBodePng({ ...plot, title }, { width: 480, pixelWidth: 480 }))).toEqual([]);
				}),
				propertyParams(25)
			);
		},
		propertyTimeout()
	);
});

describe('the PDF draws every character with a glyph of the face it chose', () => {
	const faces: Record<string, Font> = {
		mono: create(readFileSync(jetBrainsMonoTtf())) as Font,
		'mono-bold': create(readFileSync(jetBrainsMonoTtf('bold'))) as Font,
		fallback: create(readFileSync(dejaVuSansTtf())) as Font,
		'fallback-bold': create(readFileSync(dejaVuSansTtf('bold'))) as Font,
		emoji: create(readFileSync(notoEmojiTtf())) as Font
	};
	// Helvetica in pdfkit shows WinAnsiEncoding only [published: ISO 32000-1 Annex D.2]: Latin-1 plus 27 Windows-1252 extras.
	const winAnsiExtras = '€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ';
	const helvetica = (c: string) => /^[\x20-\x7e\xa0-\xff]$/.test(c) || winAnsiExtras.includes(c);

	it('for every style and any text', () => {
		fc.assert(
			fc.property(fc.constantFrom<TextStyle>('prose', 'prose-bold', 'mono', 'mono-bold'), userText(60), (style, text) => {
				const { font, text: drawn } = fontFor(style, text, { multiline: true });
				for (const c of drawn) {
					if (c === '\n') continue;
					const has = font.startsWith('Helvetica') ? helvetica(c) : faces[font].hasGlyphForCodePoint(c.codePointAt(0)!);
					expect(has, `${font} lacks U+${c.codePointAt(0)!.toString(16)} of ${JSON.stringify(text)}`).toBe(true);
				}
			}),
			propertyParams(500)
		);
	});

	it('plain ASCII stays in the style’s own face and unchanged; what no face has becomes U+FFFD, not silence', () => {
		expect(fontFor('prose', 'Rail 5V0_MAIN')).toEqual({ font: 'Helvetica', text: 'Rail 5V0_MAIN' });
		expect(fontFor('mono', 'fc 40k -> 60k')).toEqual({ font: 'mono', text: 'fc 40k -> 60k' });
		expect(fontFor('prose', 'Ω 5 V')).toEqual({ font: 'fallback', text: 'Ω 5 V' });
		// No font here has CJK ideographs: each becomes the replacement glyph of the face with the most coverage.
		expect(fontFor('prose', 'Rail 中文')).toEqual({ font: 'fallback', text: `Rail ${REPLACEMENT}${REPLACEMENT}` });
		expect(fontFor('prose', 'a\u0000b')).toEqual({ font: 'fallback', text: `a${REPLACEMENT}b` });
	});
});
