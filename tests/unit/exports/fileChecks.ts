// Independent checks that an export is a well-formed file, used by the unit and HTTP property tests.
// PDF: header, trailer and every cross-reference entry pointing at its object [published: ISO 32000-1
// §7.5.2 header, §7.5.4 cross-reference table, §7.5.5 trailer]. PNG: signature, IHDR first, IEND last,
// every chunk length inside the file, and the IDAT stream inflating to exactly height × (1 + width ×
// bytes per pixel) [published: PNG specification (ISO/IEC 15948) §5, §7.2, §11.2.2]. SVG: resvg's strict
// XML parser accepts it.
import { inflateSync } from 'node:zlib';
import { Resvg } from '@resvg/resvg-js';

export function pdfProblems(pdf: Buffer): string[] {
	const s = pdf.toString('latin1');
	const problems: string[] = [];
	if (!/^%PDF-1\.\d/.test(s)) problems.push('no %PDF-1.n header');
	if (!/%%EOF\s*$/.test(s)) problems.push('no %%EOF at the end');
	const start = /startxref\s+(\d+)\s+%%EOF\s*$/.exec(s);
	if (!start) return [...problems, 'no startxref'];
	const at = Number(start[1]);
	const table = /^xref\s+(\d+) (\d+)\s+/.exec(s.slice(at));
	if (!table) return [...problems, `no xref table at ${at}`];
	const first = Number(table[1]);
	const count = Number(table[2]);
	const entries = s.slice(at + table[0].length, at + table[0].length + 20 * count);
	for (let i = 0; i < count; i++) {
		const entry = /^(\d{10}) (\d{5}) ([nf])/.exec(entries.slice(20 * i, 20 * i + 20));
		if (!entry) {
			problems.push(`xref entry ${i} malformed`);
			continue;
		}
		if (entry[3] !== 'n') continue;
		const offset = Number(entry[1]);
		if (!s.startsWith(`${first + i} ${Number(entry[2])} obj`, offset)) problems.push(`object ${first + i} not at its offset ${offset}`);
	}
	const trailer = /trailer\s*<<([\s\S]*?)>>\s*startxref/.exec(s);
	if (!trailer || !/\/Root \d+ 0 R/.test(trailer[1])) problems.push('trailer without /Root');
	if (trailer && Number(/\/Size (\d+)/.exec(trailer[1])?.[1]) !== first + count) problems.push('trailer /Size differs from the xref');
	return problems;
}

export function pngProblems(png: Buffer): string[] {
	const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
	if (png.length < 8 || !png.subarray(0, 8).equals(signature)) return ['no PNG signature'];
	const chunks: { type: string; data: Buffer }[] = [];
	for (let pos = 8; pos < png.length; ) {
		if (pos + 12 > png.length) return ['truncated chunk header'];
		const length = png.readUInt32BE(pos);
		const type = png.toString('latin1', pos + 4, pos + 8);
		if (pos + 12 + length > png.length) return [`chunk ${type} runs past the end`];
		chunks.push({ type, data: png.subarray(pos + 8, pos + 8 + length) });
		pos += 12 + length;
	}
	const problems: string[] = [];
	if (chunks[0]?.type !== 'IHDR') problems.push('IHDR is not first');
	if (chunks.at(-1)?.type !== 'IEND') problems.push('IEND is not last');
	const ihdr = chunks[0]?.data;
	if (!ihdr || ihdr.length !== 13) return [...problems, 'IHDR is not 13 bytes'];
	const width = ihdr.readUInt32BE(0);
	const height = ihdr.readUInt32BE(4);
	const bitDepth = ihdr[8];
	const channels = ({ 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 } as Record<number, number>)[ihdr[9]];
	if (!width || !height || !channels || bitDepth !== 8) return [...problems, `unexpected IHDR ${width}x${height} depth ${bitDepth} type ${ihdr[9]}`];
	const pixels = inflateSync(Buffer.concat(chunks.filter((c) => c.type === 'IDAT').map((c) => c.data)));
	if (pixels.length !== height * (1 + width * channels)) problems.push(`IDAT inflates to ${pixels.length} bytes, expected ${height * (1 + width * channels)}`);
	return problems;
}

export function svgProblems(svg: string): string[] {
	try {
		new Resvg(svg, { font: { loadSystemFonts: false } });
		return [];
	} catch (error) {
		return [String(error)];
	}
}
