/**
 * The switched linear circuit of a voltage-mode or peak current-mode buck or boost in CCM, as two state matrices (switch
 * on, switch off) over one augmented state: the circuit's own states, then three exogenous ones
 * (the constant 1 that carries Vin, Vref and a load-step current, and sin ωt, cos ωt of the
 * injected sine). Each interval is then the autonomous x' = Ā·x, solved exactly by e^(Ā·t).
 * Same elements as the averaged model (docs/formulas.md §1–§5): L with r = DCR + Rds(on) in series
 * in both intervals (synchronous switches), every capacitor-bank branch with its C, ESR and ESL,
 * resistive load, and the compensator network with the ideal or single-pole op-amp (§5.6) or the
 * OTA (§5.5), driven from the sensed node vs = vout + injection (docs/formulas.md §13).
 * The comparator row and its ramp are the only difference between the two control methods
 * (comparator.ts).
 */
import type { EquivalentBranch } from '../plants/capacitorBank';
import type { OpampModel } from '../compensators/transfer';
import type { NetworkParts } from '../synthesis/networks';
import { comparatorOf, type ComparatorSpec, type CurrentModeCircuit } from './comparator';

export interface SwitchingCircuitInput {
	topology: 'buck' | 'boost';
	vin: number;
	/** r = DCR + Rds(on), Ω, in series with the inductor in both intervals. */
	rSeries: number;
	l: number;
	rLoad: number;
	branches: readonly EquivalentBranch[];
	network: NetworkParts;
	opamp: OpampModel | null;
	vref: number;
	/** Peak-to-peak PWM ramp, V (the ramp rises from 0 V to vramp each period); voltage mode only. */
	vramp: number;
	fswHz: number;
	/** Peak current mode: the sensed inductor current plus the ramp Se meets the amplifier output. */
	currentMode?: CurrentModeCircuit | null;
}

export interface SwitchedSystem {
	/** Augmented dimension (circuit states + 3). */
	n: number;
	/** Circuit states. */
	nc: number;
	names: string[];
	/** Ā with the switch on and off (row-major n×n). */
	aOn: Float64Array;
	aOff: Float64Array;
	/** Rows over the augmented state: output voltage (depends on the switch for the boost), comparator margin without its ramp. */
	voutOn: Float64Array;
	voutOff: Float64Array;
	control: Float64Array;
	/** Row of the amplifier output vc (the control voltage). */
	amplifier: Float64Array;
	/** The comparator's ramp (V/s), its maximum duty and the scale of its margin (docs/formulas.md §13.2). */
	comparator: ComparatorSpec;
	/** Index of the inductor current, of the constant 1, of sin ωt and cos ωt. */
	iL: number;
	one: number;
	sin: number;
	cos: number;
}

export interface InjectionSpec {
	/** Injection angular frequency, rad/s (0 for none). */
	omega: number;
	/** Amplitude of the sine added in the feedback path, V. */
	amplitude: number;
	/** Extra load current drawn from the output (a load step), A. */
	loadStep?: number;
}

type Row = Float64Array;

/** Build Ā_on, Ā_off and the output rows for one injection. */
export function switchedSystem(c: SwitchingCircuitInput, inj: InjectionSpec): SwitchedSystem {
	const names: string[] = ['iL'];
	const branchIdx: { vc: number; i: number | null; kind: 'L' | 'R' | 'C'; b: EquivalentBranch }[] = [];
	let pureC = -1;
	for (const b of c.branches) {
		const kind = b.esl > 0 ? 'L' : b.esr > 0 ? 'R' : 'C';
		const vc = names.push(`vBank${branchIdx.length}`) - 1;
		const i = kind === 'L' ? names.push(`iBank${branchIdx.length}`) - 1 : null;
		if (kind === 'C') pureC = branchIdx.length;
		branchIdx.push({ vc, i, kind, b });
	}
	const net = c.network;
	const finite = c.opamp !== null && net.kind !== 'type2-ota';
	const comp: Record<string, number> = {};
	const add = (name: string) => (comp[name] = names.push(name) - 1);
	if (net.kind === 'type2-ota') {
		add('vo');
		add('vC1');
	} else {
		add('vF'); // voltage across the capacitor from the inverting input to the output (C2; C1 for Type I)
		if (net.kind !== 'type1') add('vC1');
		if (net.kind === 'type3') add('vC3');
		if (finite) add('vo');
	}
	const nc = names.length;
	const n = nc + 3;
	const one = nc;
	const sinI = nc + 1;
	const cosI = nc + 2;
	const row = (): Row => new Float64Array(n);
	const unit = (k: number, scale = 1): Row => {
		const r = row();
		r[k] = scale;
		return r;
	};
	const lin = (...terms: [number, Row][]): Row => {
		const r = row();
		for (const [k, v] of terms) for (let j = 0; j < n; j++) r[j] += k * v[j];
		return r;
	};
	const iStep = inj.loadStep ?? 0;

	const build = (on: boolean) => {
		const a = new Float64Array(n * n);
		const set = (i: number, r: Row) => a.set(r, i * n);
		// Current from the converter into the output node.
		const iIn = c.topology === 'buck' || !on ? unit(0) : row();
		// Output node voltage from KCL.
		let v: Row;
		if (pureC >= 0) v = unit(branchIdx[pureC].vc);
		else {
			let g = 1 / c.rLoad;
			const terms: [number, Row][] = [[1, iIn], [-iStep, unit(one)]];
			for (const br of branchIdx) {
				if (br.kind === 'L') terms.push([-1, unit(br.i!)]);
				else {
					g += 1 / br.b.esr;
					terms.push([1 / br.b.esr, unit(br.vc)]);
				}
			}
			v = lin(...terms.map(([k, r]) => [k / g, r] as [number, Row]));
		}
		// Inductor.
		const vin = unit(one, c.vin);
		if (c.topology === 'buck') set(0, lin([on ? 1 / c.l : 0, vin], [-c.rSeries / c.l, unit(0)], [-1 / c.l, v]));
		else set(0, lin([1 / c.l, vin], [-c.rSeries / c.l, unit(0)], [on ? 0 : -1 / c.l, v]));
		// Capacitor branches.
		for (const br of branchIdx) {
			const { b } = br;
			if (br.kind === 'L') {
				set(br.vc, unit(br.i!, 1 / b.c));
				set(br.i!, lin([1 / b.esl, v], [-1 / b.esl, unit(br.vc)], [-b.esr / b.esl, unit(br.i!)]));
			} else if (br.kind === 'R') set(br.vc, lin([1 / (b.esr * b.c), v], [-1 / (b.esr * b.c), unit(br.vc)]));
		}
		if (pureC >= 0) {
			const terms: [number, Row][] = [[1, iIn], [-1 / c.rLoad, v], [-iStep, unit(one)]];
			for (const br of branchIdx) {
				if (br.kind === 'L') terms.push([-1, unit(br.i!)]);
				else if (br.kind === 'R') terms.push([1 / br.b.esr, unit(br.vc)], [-1 / br.b.esr, v]);
			}
			set(branchIdx[pureC].vc, lin(...terms.map(([k, r]) => [k / branchIdx[pureC].b.c, r] as [number, Row])));
		}
		// Compensator, driven from the sensed node.
		const vs = lin([1, v], [inj.amplitude, unit(sinI)]);
		const amplifier = compensatorRows(net, c, finite, comp, vs, { row, unit, lin, set, one });
		// Exogenous generator: d/dt sin = ω cos, d/dt cos = −ω sin.
		a[sinI * n + cosI] = inj.omega;
		a[cosI * n + sinI] = -inj.omega;
		return { a, v, amplifier };
	};
	const on = build(true);
	const off = build(false);
	const { control, spec } = comparatorOf(c, on.amplifier, 0);
	return {
		n,
		nc,
		names,
		aOn: on.a,
		aOff: off.a,
		voutOn: on.v,
		voutOff: off.v,
		control,
		amplifier: on.amplifier,
		comparator: spec,
		iL: 0,
		one,
		sin: sinI,
		cos: cosI
	};
}

interface RowKit {
	row: () => Row;
	unit: (k: number, scale?: number) => Row;
	lin: (...terms: [number, Row][]) => Row;
	set: (i: number, r: Row) => void;
	one: number;
}

/** The network's state equations; returns the row of the amplifier output (the comparator input). */
function compensatorRows(
	net: NetworkParts,
	c: SwitchingCircuitInput,
	finite: boolean,
	s: Record<string, number>,
	vs: Row,
	k: RowKit
): Row {
	const { unit, lin, set, one } = k;
	const vref = unit(one, c.vref);
	if (net.kind === 'type2-ota') {
		// i = gm·(Vref − H·vs) into C2 ∥ (R2 + C1) ∥ Ro (§5.5).
		const h = net.rb === null ? 1 : net.rb / (net.r1 + net.rb);
		const vo = unit(s.vo);
		const iR2 = lin([1 / net.r2, vo], [-1 / net.r2, unit(s.vC1)]);
		const terms: [number, Row][] = [[net.gm, vref], [-net.gm * h, vs], [-1, iR2]];
		if (net.ro != null) terms.push([-1 / net.ro, vo]);
		set(s.vo, lin(...terms.map(([x, r]) => [x / net.c2, r] as [number, Row])));
		set(s.vC1, lin([1 / net.c1, iR2]));
		return vo;
	}
	// Op-amp: vF = v− − vo across the feedback capacitor (C2, or C1 for Type I).
	const vF = unit(s.vF);
	const vo = finite ? unit(s.vo) : lin([1, vref], [-1, vF]);
	const vMinus = finite ? lin([1, vo], [1, vF]) : vref;
	const input: [number, Row][] = [
		[1 / net.r1, vs],
		[-1 / net.r1, vMinus]
	];
	if (net.rb !== null) input.push([-1 / net.rb, vMinus]);
	if (net.kind === 'type3') {
		const i3 = lin([1 / net.r3, vs], [-1 / net.r3, vMinus], [-1 / net.r3, unit(s.vC3)]);
		input.push([1, i3]);
		set(s.vC3, lin([1 / net.c3, i3]));
	}
	if (net.kind === 'type1') set(s.vF, lin(...input.map(([x, r]) => [x / net.c1, r] as [number, Row])));
	else {
		const iR2 = lin([1 / net.r2, vF], [-1 / net.r2, unit(s.vC1)]);
		set(s.vF, lin(...input.map(([x, r]) => [x / net.c2, r] as [number, Row]), [-1 / net.c2, iR2]));
		set(s.vC1, lin([1 / net.c1, iR2]));
	}
	if (finite) {
		// A(s) = A0/(1 + s/ωa): vo' = ωa·(A0·(0 − (v− − Vref)) − vo) (§5.6).
		const a0 = 10 ** (c.opamp!.a0Db / 20);
		const wa = (2 * Math.PI * c.opamp!.gbw) / a0;
		set(s.vo, lin([wa * a0, vref], [-wa * a0, vMinus], [-wa, vo]));
	}
	return vo;
}
