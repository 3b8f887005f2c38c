// Text of a PDF, page by page, through Mozilla's PDF.js (pdfjs-dist): it decodes text set in the
// standard fonts and, through their ToUnicode maps, in embedded fonts (pdfkit embeds JetBrains
// Mono with one), so a test reads the report as a reader would. Runs are joined as PDF.js
// reports them, a newline where it sees a line end.
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

export interface PdfTextDump {
	text: string;
	pages: number;
}

export async function pdfText(pdf: Buffer | Uint8Array): Promise<PdfTextDump> {
	const doc = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, isEvalSupported: false, verbosity: 0 }).promise;
	let text = '';
	for (let i = 1; i <= doc.numPages; i++) {
		const content = await (await doc.getPage(i)).getTextContent();
		for (const item of content.items) if ('str' in item) text += item.str + (item.hasEOL ? '\n' : '');
		text += '\n';
	}
	const pages = doc.numPages;
	await doc.destroy();
	// The embedded font draws the micro sign and the Greek mu with one glyph, which its ToUnicode
	// map names as the Greek letter; the app writes the micro sign (U+00B5).
	return { text: text.replace(/\u03bc/g, '\u00b5'), pages };
}

/** The text with every run of white space as one space, for phrase checks across line breaks. */
export const flat = (t: string) => t.replace(/\s+/g, ' ');
