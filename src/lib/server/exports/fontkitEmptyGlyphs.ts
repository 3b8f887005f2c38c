/**
 * fontkit 2.0.4, pdfkit's font engine (latest release), measures a glyph by decoding its 10-byte `glyf` header
 * even when the glyph has no outline (a zero-length `loca` entry, as for space-like glyphs). The read then
 * lands on the next glyph's header, or, for the font's last glyph, past the end of the table: RangeError
 * "Offset is outside the bounds of the DataView" (upstream issue foliojs/fontkit#378, no release with a fix).
 * JetBrains Mono's last glyph is the empty spacer its code ligatures substitute for `->`, `>=`, `||`, `::`,
 * `...`, `/*` and friends, so any of those in a report crashed the PDF export.
 *
 * fontkit's own outline decoder already treats such a glyph as empty; this gives its bounding-box reader the
 * same rule, once per process, on the one fontkit module pdfkit imports.
 */
import { readFileSync } from 'node:fs';
import { create, type Font } from 'fontkit';
import { jetBrainsMonoTtf } from './fonts';

interface GlyphInternals {
	id: number;
	_font: { loca?: { offsets: number[] }; _variationProcessor?: unknown };
	_getCBox(internal?: boolean): unknown;
}

let patched = false;

export function guardEmptyGlyphs(): void {
	if (patched) return;
	patched = true;
	const font = create(readFileSync(jetBrainsMonoTtf())) as Font;
	// Glyph 0 (.notdef) has an outline: its box gives us fontkit's TrueType glyph class and its box class.
	const sample = font.getGlyph(0) as unknown as GlyphInternals;
	const proto = Object.getPrototypeOf(sample) as GlyphInternals;
	const Box = (Object.getPrototypeOf(sample._getCBox(true)) as { constructor: new (a: number, b: number, c: number, d: number) => unknown }).constructor;
	const emptyBox = Object.freeze(new Box(0, 0, 0, 0));
	const original = proto._getCBox;
	proto._getCBox = function (this: GlyphInternals, internal?: boolean) {
		const offsets = this._font.loca?.offsets;
		// A variable font decodes the outline instead (the original's first branch), which handles empty glyphs.
		const decodesOutline = this._font._variationProcessor && !internal;
		if (!decodesOutline && offsets && offsets[this.id] === offsets[this.id + 1]) return emptyBox;
		return original.call(this, internal);
	};
}
