/**
 * Where a warning or a figure appeared, as one short phrase: the corners' labels ("Vin min, Iout
 * max, L −20 %, C +20 %") grouped by operating point, each group once with the number of tolerance
 * cases behind it, so a list never repeats "Vin nom, Iout nom; Vin nom, Iout nom, L +20 %; …".
 * The design screen, the stored verdict and the PDF print this text.
 */

/** "Vin nom, Iout nom" of a corner label (its first two parts); the whole label when it has fewer. */
export function operatingPointOf(label: string): string {
	const parts = label.split(', ');
	return parts.length > 2 ? parts.slice(0, 2).join(', ') : label;
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
