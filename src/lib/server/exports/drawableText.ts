/**
 * Text a user typed (names, messages, comments), made safe for every export format: control characters
 * (C0 except tab and line breaks, DEL, C1), lone UTF-16 surrogates and the noncharacters U+FFFE / U+FFFF become
 * the visible replacement character U+FFFD. Those are exactly what XML 1.0 forbids in an SVG (resvg refuses the
 * whole file) and what has no glyph in any font. Tabs become a space; line breaks stay only where asked.
 */
export const REPLACEMENT = '\uFFFD';

// Lone surrogates: a high one not followed by a low one, or a low one not preceded by a high one.
const FORBIDDEN = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

export function drawableText(text: string, options: { multiline?: boolean } = {}): string {
	const clean = text.replace(FORBIDDEN, REPLACEMENT).replace(/\t/g, ' ');
	return options.multiline ? clean.replace(/\r\n?|\u2028|\u2029/g, '\n') : clean.replace(/\r\n?|\n|\u2028|\u2029/g, ' ');
}
