// Text a user can type into any field (names, revision messages, comments), for the export properties:
// arbitrary code points, arbitrary UTF-16 code units (lone surrogates included), graphemes, and runs of
// the pieces that broke or could break a renderer: code-ligature sequences of the mono font, markup,
// emoji (skin tones, ZWJ families, flags), CJK, right-to-left scripts, combining marks, controls,
// bidi overrides, noncharacters.
import fc from 'fast-check';

export const HOSTILE_PIECES = [
	'fc 40k -> 60k', '>=', '<=', '||', '...', '::', '/*', '*/', '<>', '!=', '==', '=>', '<!--', '&amp;', ']]>', '"\'',
	'😀', '👍🏽', '👨‍👩‍👧', '🇩🇪', '中文', '日本語の設計', '한국어', 'שלום', 'مرحبا', 'e\u0301', 'a\u0308\u0323', '\u202Eevil', '\u200D',
	'\uFE0F', '\ud800', '\udfff', '\u0000', '\u0001', '\u001b[31m', '\u007f', '\u0085', '\uFFFE', '\uFFFF', '\t', '\r\n', '\u2028',
	'Ω µ ° ± √ ∞ ≈', '𝔘𝔫𝔦', 'ﬁ', '\u00AD', ' '
];

const codeUnit = fc.integer({ min: 0, max: 0xffff }).map((n) => String.fromCharCode(n));

export const userText = (maxLength = 40): fc.Arbitrary<string> =>
	fc.oneof(
		fc.array(fc.constantFrom(...HOSTILE_PIECES), { minLength: 1, maxLength: 6 }).map((a) => a.join(' ')),
		fc.string({ unit: 'binary', minLength: 1, maxLength }),
		fc.string({ unit: codeUnit, minLength: 1, maxLength }),
		fc.string({ unit: 'grapheme', minLength: 1, maxLength })
	);

/** Like userText, always with at least one of the hostile pieces, for properties that can afford only a few cases. */
export const hostileUserText = (maxLength = 40): fc.Arbitrary<string> =>
	fc.tuple(userText(maxLength), fc.constantFrom(...HOSTILE_PIECES), fc.boolean()).map(([text, piece, before]) => (before ? `${piece} ${text}` : `${text} ${piece}`));
