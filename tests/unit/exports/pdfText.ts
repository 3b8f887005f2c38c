// Minimal text extraction from pdfkit output, for tests where poppler's pdftotext is not installed: inflate every
// content stream and decode the hex strings of Tj/TJ operators set in the PDF standard fonts (WinAnsi bytes).
// Text in embedded TrueType fonts is glyph ids and is only counted, not decoded.
import { inflateSync } from 'node:zlib';

export interface PdfTextDump {
	standardText: string;
	embeddedRuns: number;
	pages: number;
}

export function pdfText(pdf: Buffer): PdfTextDump {
	const s = pdf.toString('latin1');
	const standardFonts = new Set<string>();
	// Font resources: "/F1 7 0 R" in the page resources, and the object "7 0 obj << /Type /Font /Subtype /Type1 ...".
	for (const m of s.matchAll(/(\d+) 0 obj\s*<<\s*\/Type \/Font\s*\/BaseFont \/[^\s/]+\s*\/Subtype \/Type1/g)) standardFonts.add(m[1]);
	for (const m of s.matchAll(/(\d+) 0 obj\s*<<\s*\/Type \/Font\s*\/Subtype \/Type1/g)) standardFonts.add(m[1]);
	const nameToObj = new Map<string, string>();
	for (const m of s.matchAll(/\/(F\d+) (\d+) 0 R/g)) nameToObj.set(m[1], m[2]);

	let text = '';
	let embeddedRuns = 0;
	const re = /stream\r?\n/g;
	let m: RegExpExecArray | null;
	while ((m = re.exec(s))) {
		const start = m.index + m[0].length;
		const end = s.indexOf('endstream', start);
		let content: string;
		try {
			content = inflateSync(pdf.subarray(start, end)).toString('latin1');
		} catch {
			content = pdf.subarray(start, end).toString('latin1');
		}
		let font = '';
		for (const op of content.matchAll(/\/(F\d+) [\d.]+ Tf|\[([^\]]*)\] TJ|<([0-9a-f]*)> Tj|\bET\b/g)) {
			if (op[1]) font = op[1];
			else if (op[0] === 'ET') text += '\n';
			else {
				const hex = op[2] !== undefined ? [...op[2].matchAll(/<([0-9a-f]*)>/g)].map((h) => h[1]).join('') : op[3];
				const obj = nameToObj.get(font);
				if (obj && standardFonts.has(obj)) text += Buffer.from(hex, 'hex').toString('latin1');
				else embeddedRuns++;
			}
		}
	}
	const pages = (s.match(/\/Type \/Page\b/g) ?? []).length;
	return { standardText: text, embeddedRuns, pages };
}
