/**
 * Where a warning or a figure appeared, as one short phrase: the corners' labels ("Vin min, Iout
 * max, L −20 %, C +20 %") grouped by operating point, each group once with the number of tolerance
 * cases behind it, so a list never repeats "Vin nom, Iout nom; Vin nom, Iout nom, L +20 %; …".
 * The design screen, the stored verdict and the PDF print this text.
 */

/** The leading words of a corner label that name its operating point: Vin, Iout and temperature. */
const OPERATING_WORD = /^(Vin|Iout|T) /;

/** Splits a corner label into its operating point ("Vin max, Iout min, T hot") and its part tolerances ("L −20 %", …). */
export function splitCornerLabel(label: string): { operating: string; parts: string[] } {
	const words = label.split(', ');
	let n = 0;
	while (n < words.length && OPERATING_WORD.test(words[n])) n++;
	if (n === 0) return { operating: label, parts: [] };
	return { operating: words.slice(0, n).join(', '), parts: words.slice(n) };
}

/** "Vin nom, Iout nom" of a corner label (with T when the corner names one); the whole label when it names no operating point. */
export function operatingPointOf(label: string): string {
	return splitCornerLabel(label).operating;
}

/**
 * A verdict row's reason for a table that already shows the row's corner beside it: the corner's
 * words, which can run to a dozen part tolerances, are replaced by "the corner shown".
 */
export function reasonBesideCorner(reason: string, corner: string | null): string {
	if (!corner || corner.length < 12) return reason;
	return reason.split(corner).join('the corner shown');
}

export function cornerListText(labels: readonly string[], options: { total?: number; maxGroups?: number } = {}): string {
	const unique = [...new Set(labels)];
	if (!unique.length) return '';
	const { total, maxGroups = 3 } = options;
	if (total !== undefined && total > 1 && unique.length >= total) return `every corner (${total})`;
	const groups = new Map<string, string[]>();
	for (const l of unique) {
		const op = operatingPointOf(l);
		const g = groups.get(op);
		if (g) g.push(l);
		else groups.set(op, [l]);
	}
	const phrases = [...groups.entries()].map(([op, members]) =>
		members.length === 1 ? members[0] : `${op} (${members.length} tolerance cases)`
	);
	const shown = phrases.slice(0, maxGroups);
	const rest = phrases.length - shown.length;
	return shown.join('; ') + (rest > 0 ? `; and ${rest} more operating point${rest === 1 ? '' : 's'}` : '');
}

/** The sentence that follows a warning's own message: "At Vin min, Iout min (28 tolerance cases)." ('' when no corner is named). */
export function warningWhereText(corners: readonly string[], total?: number): string {
	const list = cornerListText(corners, { total });
	return list ? `At ${list}.` : '';
}

/** "Vin max, Iout min with 12 part tolerances": a corner's name short enough for a sentence on screen. */
export function shortCornerText(label: string): string {
	const { operating, parts } = splitCornerLabel(label);
	if (parts.length <= 1) return label;
	return `${operating} with ${parts.length} part tolerances`;
}

/** A sentence (a verdict summary) with each named corner shortened; the stored text keeps the full names. */
export function withShortCorners(text: string, corners: readonly (string | null)[]): string {
	let out = text;
	for (const c of new Set(corners)) if (c && c.length >= 12) out = out.split(c).join(shortCornerText(c));
	return out;
}
