/**
 * Small-signal model of the VM buck and boost in discontinuous conduction (docs/formulas.md §4.2):
 * the reduced-order averaged-switch model [published: E&M 2nd ed. Ch. 11, the DCM switch network
 * averaged over a period with the inductor current zero at its start and end, so the inductor
 * leaves the low-frequency dynamics; recalled]. The averaged currents of the switch network, with
 * d the duty, vg the input and v the output voltage and Ts = 1/fsw [derived from the DCM
 * waveforms: peak current, the diode's interval from the inductor's volt-second balance]:
 *   buck:  i2 = d²·Ts·vg·(vg − v)/(2L·v) into the output,  i1 = d²·Ts·(vg − v)/(2L) from the input
 *   boost: i2 = d²·Ts·vg²/(2L·(v − vg)),                  i1 = d²·Ts·vg·v/(2L·(v − vg))
 * Linearised at the operating point (partial derivatives in closed form, §4.2), the output node is
 * î2 = j2·d̂ + f2·v̂g − g2·v̂ into the load R and the capacitor bank, so with G = 1/R + g2 and the
 * bank's admittance S/Q (plants/capacitorBank.ts):
 *   Zp = Q/(G·Q + S),  Gvd = j2·Zp,  Gvg = f2·Zp,  Zo = Zp,
 *   ZD = 1/(a + b·f2·Zp) (d̂ = 0),  ZN = 1/(a − c·f2/j2) (v̂ = 0), with a, b, c the derivatives of i1.
 * With one capacitor and no ESR, Gvd is E&M's Gd0/(1 + s/ωp): buck Gd0 = (2V/D)(1 − M)/(2 − M),
 * ωp = (2 − M)/((1 − M)RC); boost Gd0 = (2V/D)(M − 1)/(2M − 1), ωp = (2M − 1)/((M − 1)RC).
 * The switch and winding resistances are left out (the textbook model is lossless).
 * The source's high-frequency terms (the inductor's pole near fsw and, for the boost, an RHP zero)
 * enter here as their low-frequency equivalent, a delay of the control path [derived here, from
 * where in the period the extra charge of a later turn-off reaches the output]: a later turn-off
 * adds charge spread evenly over the diode interval D2·Ts (D2 = D(Vg − V)/V for the buck, D·Vg/(V − Vg)
 * for the boost), so τ = D2·Ts/2 after the edge for the buck; the boost also loses the diode's
 * peak current during the extra on-time and gets it back over the diode interval, which moves the
 * centroid to τ = (D + D2)·Ts/2. The delay leaves the magnitude alone.
 * Checked against switching simulations in ngspice (reference/dcm) up to fsw/10.
 */
import { polyAdd, polyScale } from '../math/polynomial';
import type { FactoredTf } from '../tf/types';
import type { OutputNetwork } from './capacitorBank';
import { factorNormalised } from './factorPoly';

export interface DcmStage {
	topology: 'buck' | 'boost';
	vin: number;
	vout: number;
	iout: number;
	l: number;
	fswHz: number;
}

/** The duty that gives vout at iout in DCM (the averaged current i2 equal to the load current). */
export function dcmDuty(p: DcmStage): number {
	const { vin: vg, vout: v, iout: i, l, fswHz } = p;
	const ts = 1 / fswHz;
	return p.topology === 'buck' ? Math.sqrt((2 * l * i * v) / (ts * vg * (vg - v))) : Math.sqrt((2 * l * i * (v - vg)) / (ts * vg * vg));
}

/** Delay of the control path (see above), s. */
export function dcmControlDelayS(p: DcmStage, duty: number): number {
	const ts = 1 / p.fswHz;
	const d2 = p.topology === 'buck' ? (duty * (p.vin - p.vout)) / p.vout : (duty * p.vin) / (p.vout - p.vin);
	return ((p.topology === 'buck' ? d2 : duty + d2) * ts) / 2;
}

/** The linearised switch network: output-node and input-current coefficients. */
export function dcmCoefficients(p: DcmStage): { duty: number; j2: number; f2: number; g2: number; a: number; b: number; c: number } {
	const { vin: vg, vout: v, iout: i } = p;
	const m = v / vg;
	const duty = dcmDuty(p);
	const i1 = m * i; // lossless power balance
	const j2 = (2 * i) / duty;
	const c = (2 * i1) / duty;
	if (p.topology === 'buck') {
		return {
			duty,
			j2,
			c,
			f2: ((i / vg) * (2 - m)) / (1 - m),
			g2: i / v / (1 - m),
			// i1 = d²Ts(vg − v)/(2L): ∂/∂vg = −∂/∂v = d²Ts/(2L) = i1/(vg − v)
			a: i1 / (vg - v),
			b: -i1 / (vg - v)
		};
	}
	return {
		duty,
		j2,
		c,
		f2: ((i / vg) * (2 * m - 1)) / (m - 1),
		g2: ((i / v) * m) / (m - 1),
		a: ((i1 / vg) * m) / (m - 1),
		b: -(i1 / v) / (m - 1)
	};
}

export interface DcmTransferFunctions {
	gvd: FactoredTf;
	gvg: FactoredTf;
	zo: FactoredTf;
	zd: FactoredTf;
	zn: FactoredTf;
	poles: FactoredTf['poles'];
	duty: number;
}

export function dcmTransferFunctions(p: DcmStage, net: OutputNetwork): DcmTransferFunctions {
	const k = dcmCoefficients(p);
	const g = 1 / (p.vout / p.iout) + k.g2;
	// G·Q + S: the output node's admittance times Q; its roots are the poles of Zp.
	const den = polyAdd(polyScale(net.qPoly, g), net.sPoly);
	const poles = factorNormalised(den);
	const qz = net.qFactors;
	const tf = (gain: number, zeros: FactoredTf['zeros'], ps: FactoredTf['poles']): FactoredTf => ({ gain, originPower: 0, zeros, poles: ps });
	// ZD = (G·Q + S)/(a·(G·Q + S) + b·f2·Q)
	const zdDen = polyAdd(polyScale(den, k.a), polyScale(net.qPoly, k.b * k.f2));
	return {
		gvd: { ...tf(k.j2 / g, [...qz], poles), delayS: dcmControlDelayS(p, k.duty) },
		gvg: tf(k.f2 / g, [...qz], poles),
		zo: tf(1 / g, [...qz], poles),
		zd: tf(g / (k.a * g + k.b * k.f2), [...poles], factorNormalised(zdDen)),
		zn: tf(1 / (k.a - (k.c * k.f2) / k.j2), [], []),
		poles,
		duty: k.duty
	};
}
