/**
 * Loss estimate of the power stage in CCM (docs/formulas.md §4.1). A synchronous stage has two
 * switches with rdsOn; a diode-rectified one (plant.lightLoad 'diode') has one switch and a diode.
 * Without part data only conduction is counted, and the result says so ("conduction only"); each
 * optional part figure adds its term:
 * - conduction: I_rms²·(rdsOn + DCR) with I_rms² = IL² + ΔiL²/12 (triangular ripple on IL)
 *   [published: E&M Ch. 2 ripple; RMS of a triangle on a DC level, standard]; with a diode the
 *   switch carries the inductor current only for D: I_rms²·(D·rdsOn + DCR) [derived: each
 *   segment of a triangular ripple has the same mean square IL² + ΔiL²/12]
 * - rectifier diode: diodeVf·IL·(1 − D), its forward drop times its average current (IL·D′ for
 *   both the buck and the boost, where it equals Iout) [published: E&M Ch. 3, the diode as a
 *   constant forward drop, recalled]
 * - switching overlap: ½·Vsw·fsw·(I_valley·tr + I_peak·tf), the hard-switched node swinging Vsw
 *   (Vin for the buck, Vout for the boost) [published: the linear-transition estimate, e.g. E&M Ch. 4]
 * - output capacitance: coss·Vsw²·fsw (½·C·V² of each of two switches' Coss per period) [common practice]
 * - reverse recovery: qrr·Vsw·fsw [common practice]
 * - dead time: vf·IL·2·deadTime·fsw (the body diode carries IL in both dead times) [common practice];
 *   none with a diode rectifier (no complementary switch, no dead time)
 * - gate drive: qg·gateDrive·fsw per switch (two, or one with a diode) [common practice]
 * With a diode the Coss term counts the one switch: ½·coss·Vsw²·fsw.
 * - inductor core: the part's core loss, W, as given.
 */
export interface LossPartData {
	/** Switch-node voltage rise and fall times, s. */
	riseTime?: number;
	fallTime?: number;
	/** Output capacitance of each switch, F. */
	coss?: number;
	/** Reverse-recovery charge of the rectifying switch's body diode, C. */
	qrr?: number;
	/** Dead time per transition, s, and the body diode's forward voltage, V. */
	deadTime?: number;
	bodyDiodeVf?: number;
	/** Total gate charge of each switch, C, and the gate-drive voltage, V. */
	qg?: number;
	gateDrive?: number;
	/** Inductor core loss at this operating point, W. */
	coreLoss?: number;
	/** Forward voltage of the rectifier diode (diode-rectified stages), V. */
	diodeVf?: number;
}

export interface LossInput {
	topology: 'buck' | 'boost';
	vin: number;
	vout: number;
	iout: number;
	fswHz: number;
	dcr: number;
	rdsOn: number;
	/** Average inductor current and its peak-to-peak ripple, A. */
	inductorCurrent: number;
	rippleCurrent: number;
	/** Main switch duty (the rectifier conducts for 1 − duty). */
	duty: number;
	/** 'diode': one switch and a rectifier diode; otherwise two synchronous switches. */
	rectifier?: 'synchronous' | 'diode';
	parts?: LossPartData;
}

export interface LossBreakdown {
	/** What was counted: 'conduction only' without part data. */
	basis: 'conduction only' | 'conduction and part data';
	/** Watts per term; a term without its part data is absent. */
	items: {
		conduction: number;
		diode?: number;
		switching?: number;
		coss?: number;
		reverseRecovery?: number;
		deadTime?: number;
		gateDrive?: number;
		core?: number;
	};
	total: number;
	/** Pout / (Pout + total). */
	efficiency: number;
}

export function lossBreakdown(p: LossInput): LossBreakdown {
	const il = p.inductorCurrent;
	const d = p.rippleCurrent;
	const vsw = p.topology === 'buck' ? p.vin : p.vout;
	const f = p.fswHz;
	const q = p.parts ?? {};
	const diode = p.rectifier === 'diode';
	const switches = diode ? 1 : 2;
	const meanSquare = il * il + (d * d) / 12;
	const items: LossBreakdown['items'] = { conduction: meanSquare * ((diode ? p.duty : 1) * p.rdsOn + p.dcr) };
	if (diode && q.diodeVf !== undefined) items.diode = q.diodeVf * il * (1 - p.duty);
	if (q.riseTime !== undefined || q.fallTime !== undefined) {
		items.switching = 0.5 * vsw * f * ((il - d / 2) * (q.riseTime ?? 0) + (il + d / 2) * (q.fallTime ?? 0));
	}
	if (q.coss !== undefined) items.coss = (switches / 2) * q.coss * vsw * vsw * f;
	if (q.qrr !== undefined) items.reverseRecovery = q.qrr * vsw * f;
	if (!diode && q.deadTime !== undefined && q.bodyDiodeVf !== undefined) items.deadTime = q.bodyDiodeVf * il * 2 * q.deadTime * f;
	if (q.qg !== undefined && q.gateDrive !== undefined) items.gateDrive = switches * q.qg * q.gateDrive * f;
	if (q.coreLoss !== undefined) items.core = q.coreLoss;
	const total = Object.values(items).reduce((a, b) => a + (b ?? 0), 0);
	const pout = p.vout * p.iout;
	const basis = Object.keys(items).length > 1 ? 'conduction and part data' : 'conduction only';
	return { basis, items, total, efficiency: pout / (pout + total) };
}
