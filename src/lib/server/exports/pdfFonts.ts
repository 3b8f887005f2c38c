/**
 * Fonts of the sign-off PDF and the choice of one font per string, so any text a user can type is drawn.
 * Each style has a chain: its own face (Helvetica for prose, a PDF standard font limited to WinAnsi; JetBrains
 * Mono for values), then DejaVu Sans (wide script and symbol coverage), then Noto Emoji. A string is set in the
 * first face that has a glyph for every character; when none has them all, in the face with the most of those that
 * have U+FFFD, and the characters it lacks become U+FFFD. One face per string keeps pdfkit's measuring exact:
 * table rows are sized with heightOfString in the same face they are drawn in.
 */
import { readFileSync } from 'node:fs';
import { create, type Font } from 'fontkit';
import { drawableText, REPLACEMENT } from './drawableText';
import { dejaVuSansTtf, jetBrainsMonoTtf, notoEmojiTtf } from './fonts';
import { guardEmptyGlyphs } from './fontkitEmptyGlyphs';

export type TextStyle = 'prose' | 'prose-bold' | 'mono' | 'mono-bold';

/** Embedded faces by the name registered on each document. */
const EMBEDDED: Record<string, () => string> = {
	mono: () => jetBrainsMonoTtf('regular'),
	'mono-bold': () => jetBrainsMonoTtf('bold'),
	fallback: () => dejaVuSansTtf('regular'),
	'fallback-bold': () => dejaVuSansTtf('bold'),
	emoji: () => notoEmojiTtf('regular')
};

const CHAINS: Record<TextStyle, string[]> = {
	prose: ['Helvetica', 'fallback', 'emoji'],
	'prose-bold': ['Helvetica-Bold', 'fallback-bold', 'emoji'],
	mono: ['mono', 'fallback', 'emoji'],
	'mono-bold': ['mono-bold', 'fallback-bold', 'emoji']
};

/**
 * What Helvetica can show in pdfkit: WinAnsiEncoding, i.e. printable ASCII, U+00A0…U+00FF and the 27 characters
 * Windows-1252 puts at 0x80…0x9F [published: ISO 32000-1 Annex D.2, WinAnsiEncoding].
 */
const WIN_ANSI_EXTRA = new Set([
	0x20ac, 0x201a, 0x0192, 0x201e, 0x2026, 0x2020, 0x2021, 0x02c6, 0x2030, 0x0160, 0x2039, 0x0152, 0x017d, 0x2018, 0x2019, 0x201c, 0x201d, 0x2022,
	0x2013, 0x2014, 0x02dc, 0x2122, 0x0161, 0x203a, 0x0153, 0x017e, 0x0178
]);
const winAnsi = (cp: number) => (cp >= 0x20 && cp <= 0x7e) || (cp >= 0xa0 && cp <= 0xff) || WIN_ANSI_EXTRA.has(cp);

/** Joiners, variation selectors and direction marks: they shape the text around them and need no glyph of their own. */
const IGNORABLE = /^[\u00AD\u200B-\u200F\u202A-\u202E\u2060-\u2064\u2066-\u206F\uFE00-\uFE0F\uFEFF]$|^[\u{E0000}-\u{E0FFF}]$/u;

const loaded = new Map<string, Font>();
function face(name: string): Font {
	let font = loaded.get(name);
	if (!font) {
		font = create(readFileSync(EMBEDDED[name]())) as Font;
		loaded.set(name, font);
	}
	return font;
}

function covers(name: string, cp: number): boolean {
	if (name.startsWith('Helvetica')) return winAnsi(cp);
	return face(name).hasGlyphForCodePoint(cp);
}

/** Registers the embedded faces on a new document (pdfkit subsets each to the glyphs used). */
export function registerReportFonts(doc: PDFKit.PDFDocument): void {
	guardEmptyGlyphs();
	for (const [name, file] of Object.entries(EMBEDDED)) doc.registerFont(name, file());
}

/** The face to set `text` in, and the text as it will be drawn (cleaned, with U+FFFD for what the face lacks). */
export function fontFor(style: TextStyle, text: string, options: { multiline?: boolean } = {}): { font: string; text: string } {
	const chars = [...drawableText(text, options)];
	const needed = chars.filter((c) => c !== '\n' && !IGNORABLE.test(c));
	const chain = CHAINS[style];
	const keep = (name: string) => (c: string) => c === '\n' || !IGNORABLE.test(c) || covers(name, c.codePointAt(0)!);
	const counts = chain.map((name) => needed.filter((c) => covers(name, c.codePointAt(0)!)).length);
	const complete = chain.findIndex((_, i) => counts[i] === needed.length);
	if (complete >= 0) return { font: chain[complete], text: chars.filter(keep(chain[complete])).join('') };
	// No face has them all: of the faces that have the replacement glyph (DejaVu Sans is in every chain), the one
	// that shows the most; what it lacks is drawn as U+FFFD.
	const withReplacement = chain.filter((name) => covers(name, REPLACEMENT.codePointAt(0)!));
	const best = withReplacement.reduce((a, b) => (counts[chain.indexOf(b)] > counts[chain.indexOf(a)] ? b : a));
	const drawn = chars.filter(keep(best)).map((c) => (c === '\n' || covers(best, c.codePointAt(0)!) ? c : REPLACEMENT));
	return { font: best, text: drawn.join('') };
}

/** Selects the face for `text` on the document and returns the text to draw with it. */
export function useFontFor(doc: PDFKit.PDFDocument, style: TextStyle, text: string, options: { multiline?: boolean } = {}): string {
	const chosen = fontFor(style, text, options);
	doc.font(chosen.font);
	return chosen.text;
}
