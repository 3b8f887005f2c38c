// Which fields of a design document to reduce when its analysis went over the pool's budget:
// the ones that scale the work (contract/designSchema.ts lists their ceilings), in order of
// how much they usually cost, each with what to do. Read loosely: the document may be invalid.
type Loose = Record<string, unknown> | undefined;
const obj = (x: unknown): Loose => (typeof x === 'object' && x !== null ? (x as Record<string, unknown>) : undefined);

export function costFields(document: unknown): Record<string, string> {
	const d = obj(document);
	const fields: Record<string, string> = {};
	const corners = obj(d?.corners);
	if (corners) fields['corners.maxCorners'] = 'reduce it (or give fewer tolerances): every corner is one more loop analysis';
	const spread = obj(d?.spread);
	if (spread) fields['spread.samples'] = 'reduce it: every sample is one more loop analysis';
	const sweep = obj(d?.sweep);
	if (sweep && 'freqHz' in sweep) fields['sweep.freqHz'] = 'give fewer frequencies';
	else if (sweep) fields['sweep.points'] = 'use fewer points';
	const delay = obj(d?.modulator)?.delay;
	if (typeof delay === 'number' && delay > 0) fields['modulator.delay'] = 'a shorter delay has fewer phase crossovers to find';
	if (d?.inputFilter !== undefined) fields['inputFilter'] = 'leave it out to analyse the loop alone';
	if (Object.keys(fields).length === 0) fields['(document)'] = 'the analysis of this design went over the budget';
	return fields;
}
