/**
 * SPICE netlist (ngspice dialect) of a design: the averaged power stage (VM, CCM; synchronous switches of equal
 * rdsOn lumped with the DCR, the contract's model) at the engine's duty, the compensator as an op-amp (or OTA)
 * circuit of its parts, the PWM gain 1/Vramp and the loop delay, arranged so that one AC analysis gives the loop gain.
 * Method: the loop is opened at the PWM comparator input, which draws no current, so opening it there loads nothing:
 * `Vd` sets the duty to D + d̂ (AC 1), the compensator answers at `ea`, and `Et` makes v(loop) = −v(ea)/Vramp, so
 * v(loop) = Gc·Fm·Gvd·e^(−sTd) = T(jω). Averaged switch network: E&M ch. 7 [published; chapter from memory].
 * Pure text generation; units SI; numbers written in plain exponent form (no SPICE suffixes: m and M clash).
 */
import { analyzeDesignDetailed, type AnalysisDetail } from '../analyze';
import type { ContractError } from '../contract/errors';
import { defaultSweepRange } from '../sweep/grid';
import { modulatorGains, type CurrentModeFeatures, type CurrentModePlant } from '../plants/currentMode';

export interface SpiceOptions {
	/** AC sweep; default: the document's sweep range, else two decades below f0 to fsw/2. */
	startHz?: number;
	stopHz?: number;
	/** Points per decade of the AC sweep [100]. */
	pointsPerDecade?: number;
	/**
	 * Where the control block writes its results with `wrdata` (frequency, |T| in dB, ∠T in degrees, unwrapped);
	 * absent: the block prints them to standard output.
	 */
	wrdataPath?: string;
	/** Gain of the VCVS standing in for an ideal op-amp [1e9]. */
	idealOpampGain?: number;
	/** End the control block with `quit`, for `ngspice -b` runs (which otherwise exit with status 1) [false]. */
	batch?: boolean;
	/** First-line title; default names the topology and the rail. */
	title?: string;
}

/** Names of the nodes a user probes in the netlist. */
export const SPICE_NODES = {
	output: 'out',
	/** Compensator (error-amplifier) output. */
	errorAmp: 'ea',
	/** The loop gain T(jω) in AC. */
	loop: 'loop',
	duty: 'd'
} as const;

/** Analyse the document and write its netlist; the contract error when the document is invalid. */
export function spiceNetlist(doc: unknown, options: SpiceOptions = {}): { netlist: string } | ContractError {
	const detail = analyzeDesignDetailed(doc, { includeResponse: false });
	if ('error' in detail) return detail;
	return { netlist: netlistFromAnalysis(detail, options) };
}

/** Write the netlist from a finished analysis (the built parts: rounded when a series is set, else ideal). */
export function netlistFromAnalysis(detail: AnalysisDetail, options: SpiceOptions = {}): string {
	const d = detail.document;
	const p = d.plant;
	const op = detail.plant.operatingPoint;
	const comp = detail.compensator;
	const built = comp.rounded ?? comp.ideal;
	const parts = built.parts;
	const vramp = detail.response.operatingPoint.rampAmplitude;
	const delayS = d.modulator.delay;
	const sweep = sweepRange(detail, options);
	const n = new NetlistWriter();

	n.line(spiceTitle(options.title ?? `Loopwright loop gain: ${p.topology} ${num(p.vin)} V to ${num(p.vout)} V, ${num(p.iout)} A, fsw ${num(p.fsw)} Hz`));
	if (d.modulator.control === 'peak-current') {
		n.comment('Averaged small-signal loop (peak current mode, CCM), written by Loopwright for ngspice.');
		n.comment('AC result: v(loop) = T(jw) = Gc * Gvc * exp(-s*Td); vdb(loop) is |T| in dB, cph(v(loop)) its phase.');
		n.comment('The loop is opened at the comparator control input (no current flows there): Vc drives vc (AC 1),');
		n.comment('Bd turns it into the duty with the sensed current and the ramp, and Et returns -v(ea).');
	} else {
		n.comment('Averaged small-signal loop (voltage mode, CCM), written by Loopwright for ngspice.');
		n.comment('AC result: v(loop) = T(jw) = Gc * (1/Vramp) * Gvd * exp(-s*Td); vdb(loop) is |T| in dB, cph(v(loop)) its phase.');
		n.comment('The loop is opened at the PWM input (no current flows there): Vd drives the duty D + d (AC 1),');
		n.comment('the compensator answers at node ea, and Et returns -v(ea)/Vramp, the duty the loop would ask for.');
	}
	n.comment(`Operating point from the engine: D = ${num(op.duty)}, IL = ${num(op.inductorCurrent)} A, R = ${num(op.rLoad)} ohm.`);
	n.comment('Small-signal estimate; confirm margins and transients on hardware.');
	n.comment('Above 60 V DC or at mains follow the applicable safety standards and licensed practice.');
	n.blank();

	n.comment('--- power stage: averaged switch network, series resistance r = DCR + rdsOn');
	n.line(`Vg in 0 DC ${num(p.vin)}`);
	const cm = (detail.plant as Partial<CurrentModePlant>).currentMode;
	if (cm) currentModulator(n, detail, cm);
	else n.line(`Vd d 0 DC ${num(op.duty)} AC 1`);
	const r = p.inductor.dcr + p.rdsOn;
	if (p.topology === 'buck') {
		// Switch node = d·vg; the input supplies d·iL.
		n.line('Bsw sw 0 V = V(d)*V(in)');
		n.line('Bin in 0 I = V(d)*I(Vil)');
		n.line('Vil sw l1 DC 0');
		seriesR(n, 'Rser', 'l1', 'l2', r);
		n.line(`L1 l2 out ${num(p.inductor.l)}`);
	} else {
		// Inductor from the input to the switch node; switch node = (1 − d)·v(out); the output receives (1 − d)·iL.
		n.line('Vil in l1 DC 0');
		seriesR(n, 'Rser', 'l1', 'l2', r);
		n.line(`L1 l2 sw ${num(p.inductor.l)}`);
		n.line('Bsw sw 0 V = (1-V(d))*V(out)');
		n.line('Bout 0 out I = (1-V(d))*I(Vil)');
	}
	p.capacitors.forEach((b, i) => {
		const k = i + 1;
		n.comment(`bank branch ${k}: ${b.count} x (C ${num(b.c)} F, ESR ${num(b.esr)} ohm, ESL ${num(b.esl)} H) in parallel, as one part`);
		let node = 'out';
		const next = (name: string) => `c${k}${name}`;
		if (b.esr > 0) {
			n.line(`Resr${k} ${node} ${next('r')} ${num(b.esr / b.count)}`);
			node = next('r');
		}
		if (b.esl > 0) {
			n.line(`Lesl${k} ${node} ${next('l')} ${num(b.esl / b.count)}`);
			node = next('l');
		}
		n.line(`Cout${k} ${node} 0 ${num(b.c * b.count)}`);
	});
	n.line(`Rload out 0 ${num(op.rLoad)}`);
	n.blank();

	n.comment('--- feedback: the divider is fed from a unity buffer so its current does not load the stage');
	n.line('Esense vs 0 out 0 1');
	n.line(`Vref ref 0 DC ${num(d.feedback.vref)}`);
	const rb = parts.rb;
	const r1 = parts.r1;
	if (comp.kind === 'type2-ota') {
		n.comment(`--- compensator: transconductance amplifier (Type II), gm = ${num(parts.gm)} S, network to ground`);
		n.line(`R1 vs fb ${num(r1)}`);
		if (rb !== undefined) n.line(`Rb fb 0 ${num(rb)}`);
		n.line(`Gota 0 ea ref fb ${num(parts.gm)}`);
		n.line(`R2 ea z1 ${num(parts.r2)}`);
		n.line(`C1 z1 0 ${num(parts.c1)}`);
		n.line(`C2 ea 0 ${num(parts.c2)}`);
		if (parts.ro !== undefined) n.line(`Ro ea 0 ${num(parts.ro)}`);
	} else {
		const label = comp.kind === 'type1' ? 'Type I' : comp.kind === 'type2' ? 'Type II' : 'Type III';
		n.comment(`--- compensator: ${label}, inverting op-amp; R1 input (divider top), Rb divider bottom`);
		n.line(`R1 vs inv ${num(r1)}`);
		if (rb !== undefined) n.line(`Rb inv 0 ${num(rb)}`);
		if (comp.kind === 'type1') {
			n.line(`C1 inv ea ${num(parts.c1)}`);
		} else {
			n.line(`R2 inv z1 ${num(parts.r2)}`);
			n.line(`C1 z1 ea ${num(parts.c1)}`);
			n.line(`C2 inv ea ${num(parts.c2)}`);
		}
		if (comp.kind === 'type3') {
			n.line(`R3 vs z2 ${num(parts.r3)}`);
			n.line(`C3 z2 inv ${num(parts.c3)}`);
		}
		const opamp = d.compensator.opamp;
		if (opamp) {
			const a0 = 10 ** (opamp.a0Db / 20);
			const omegaA = (2 * Math.PI * opamp.gbw) / a0;
			n.comment(`op-amp: A(s) = A0/(1 + s/wa), A0 = ${num(a0)} (${num(opamp.a0Db)} dB), GBW = ${num(opamp.gbw)} Hz`);
			n.line('Gamp 0 ax ref inv 1');
			n.line(`Ramp ax 0 ${num(a0)}`);
			n.line(`Camp ax 0 ${num(1 / (omegaA * a0))}`);
			n.line('Eamp ea 0 ax 0 1');
		} else {
			n.comment('ideal op-amp: a VCVS of very large gain');
			n.line(`Eamp ea 0 ref inv ${num(options.idealOpampGain ?? 1e9)}`);
		}
	}
	n.blank();

	// Peak current mode: the loop is opened at the comparator's control input, whose gain is in Bd.
	const returnGain = cm ? -1 : -1 / vramp;
	if (cm) n.comment('--- loop return: v(loop) = -v(ea), the control voltage the compensator asks for');
	else n.comment(`--- modulator: gain 1/Vramp, Vramp = ${num(vramp)} V peak-to-peak${d.modulator.feedForward ? ' (feed-forward: the ramp at this Vin)' : ''}`);
	if (delayS > 0) {
		n.comment(`loop delay ${num(delayS)} s: a matched lossless line (exact exp(-s*Td) in AC), gain 2 for the halving`);
		n.line(`Et tp 0 ea 0 ${num(returnGain)}`);
		n.line('Rdl1 tp ta 50');
		n.line(`Tdl ta 0 tb 0 Z0=50 TD=${num(delayS)}`);
		n.line('Rdl2 tb 0 50');
		n.line('Edl loop 0 tb 0 2');
	} else {
		n.line(`Et loop 0 ea 0 ${num(returnGain)}`);
	}
	n.blank();

	const ac = `ac dec ${Math.max(1, Math.round(options.pointsPerDecade ?? 100))} ${num(sweep.startHz)} ${num(sweep.stopHz)}`;
	// The same sweep as a dot analysis: `ngspice -b` runs dot analyses and exits 1 ("no simulations
	// run") when there are none, so a regression script would read success as failure. An
	// interactive run executes the control block below and leaves the dot line for `run`.
	n.line(`.${ac}`);
	n.line(`.print ac vdb(${SPICE_NODES.loop}) vp(${SPICE_NODES.loop})`);
	n.blank();
	n.line('.control');
	n.line(ac);
	n.line('let loopdb = vdb(loop)');
	n.line('let loopdeg = 180/pi*cph(v(loop))');
	if (options.wrdataPath) {
		n.line('set wr_singlescale');
		n.line('set wr_vecnames');
		n.line('option numdgt=12');
		n.line(`wrdata ${options.wrdataPath} loopdb loopdeg`);
	} else {
		n.line('print loopdb loopdeg');
	}
	if (options.batch) n.line('quit');
	n.line('.endc');
	n.line('.end');
	return n.text();
}

function sweepRange(detail: AnalysisDetail, o: SpiceOptions): { startHz: number; stopHz: number } {
	const s = detail.document.sweep;
	let range = defaultSweepRange(detail.plant.features.f0Hz, detail.document.plant.fsw);
	if (s && 'startHz' in s) range = { startHz: s.startHz, stopHz: s.stopHz };
	else if (s && 'freqHz' in s && s.freqHz.length > 1) range = { startHz: Math.min(...s.freqHz), stopHz: Math.max(...s.freqHz) };
	const startHz = o.startHz ?? range.startHz;
	const stopHz = o.stopHz ?? range.stopHz;
	if (!(startHz > 0 && stopHz > startHz && Number.isFinite(stopHz))) {
		throw new RangeError(`SPICE sweep needs 0 < startHz < stopHz, got ${startHz} to ${stopHz}`);
	}
	return { startHz, stopHz };
}

/** A series resistance; a zero one becomes a 0 V source (SPICE rejects a 0 Ω resistor). */
function seriesR(n: NetlistWriter, name: string, a: string, b: string, r: number): void {
	n.line(r > 0 ? `${name} ${a} ${b} ${num(r)}` : `V${name.slice(1)} ${a} ${b} DC 0`);
}

/** Plain exponent notation with 12 significant digits (SPICE reads "4.7e-07"; a suffix M would mean milli). */
export function num(x: number): string {
	if (!Number.isFinite(x)) throw new RangeError(`cannot write ${x} into a netlist`);
	return Number(x.toPrecision(12)).toString();
}

/** The title line must not start with a character SPICE treats specially. */
function spiceTitle(t: string): string {
	return t.replace(/[\r\n]+/g, ' ').replace(/^[.*+]/, '');
}

class NetlistWriter {
	private lines: string[] = [];
	line(s: string) {
		this.lines.push(s);
	}
	comment(s: string) {
		this.lines.push(`* ${s.replace(/[\r\n]+/g, ' ')}`);
	}
	blank() {
		this.lines.push('');
	}
	text() {
		return this.lines.join('\n') + '\n';
	}
}

/**
 * Peak current mode (docs/formulas.md §14.1): the duty comes from the comparator's averaged law
 * d = D + Fm·(vc − Ri·He(s)·(iL − IL) + kf·(vg − Vg) + kr·(vout − Vout)), with He(s)·iL built from
 * the inductor's voltage (s·iL = vL/L) and its derivative through a 1 F capacitor. `Vc` at the
 * control input carries the AC 1; its DC 0 leaves the operating point at the engine's duty.
 */
function currentModulator(n: NetlistWriter, detail: AnalysisDetail, cm: CurrentModeFeatures): void {
	const p = detail.document.plant;
	const op = detail.plant.operatingPoint;
	const mod = detail.document.modulator;
	const cmIn = { senseGain: mod.senseGain ?? 0, rampSlope: mod.rampSlope ?? 0 };
	const g = modulatorGains(p.topology, op.duty, p.inductor.l, p.fsw, cm, cmIn);
	const ts = 1 / p.fsw;
	const lNode = p.topology === 'buck' ? 'out' : 'sw';
	n.comment(`--- peak current mode: Ri = ${num(cmIn.senseGain)} V/A, Se = ${num(cm.se)} V/s, Sn = ${num(cm.sn)} V/s, mc = ${num(cm.mc)}, Qp = ${cm.qp === null ? 'inf' : num(cm.qp)} (${cm.subharmonic})`);
	n.comment('AC 1 at the comparator control input vc; He(s) = 1 - s*Ts/2 + s^2*Ts^2/pi^2 on the inductor current');
	n.line('Vc vc 0 DC 0 AC 1');
	n.line(`Evl vl 0 l2 ${lNode} 1`);
	n.line('Vder vl vl2 DC 0');
	n.line('Cder vl2 0 1');
	n.line(`Bhe he 0 V = I(Vil) - ${num(ts / 2 / p.inductor.l)}*V(vl) + ${num((ts * ts) / (Math.PI * Math.PI) / p.inductor.l)}*I(Vder)`);
	n.line(
		`Bd d 0 V = ${num(op.duty)} + ${num(g.fm)}*(V(vc) - ${num(cmIn.senseGain)}*(V(he) - ${num(op.inductorCurrent)}) + ${num(g.kf)}*(V(in) - ${num(p.vin)}) + ${num(g.kr)}*(V(out) - ${num(p.vout)}))`
	);
}
