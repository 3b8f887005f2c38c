/**
 * The control method named in the sign-off PDF, the exported plot's legend and the SPICE netlist:
 * a peak current-mode revision prints Ri, Se, mc and Qp and calls its plant Gvc; a voltage-mode one
 * prints its ramp and calls the plant Gvd. mc and Qp are checked against the published formulas
 * with the lossless duty.
 */
import { describe, expect, it } from 'vitest';
import { analyzeDesign, verifyDesign, type AnalysisResponse } from '$lib/engine';
import { spiceNetlist } from '$lib/engine/spice/netlist';
import type { Verification } from '$lib/engine/verify/types';
import { buildSignoffPdf, plotFromResponse, renderBodeSvg } from '$lib/server/exports';
import { modulatorText, networkNoteForControl, plantTraceLabel, templateControlMismatch } from '$lib/text/controlMode';
import { flat, pdfText } from '../../support/pdfText';

// 12 V → 5 V, 2 A buck at 500 kHz under peak current mode (invented values, a plausible point-of-load stage).
const cmDoc = {
	schemaVersion: 1,
	plant: { topology: 'buck', vin: 12, vout: 5, iout: 2, fsw: 500e3, inductor: { l: 10e-6, dcr: 0.015 }, capacitors: [{ c: 22e-6, esr: 0.003, count: 3 }], rdsOn: 0.01 },
	modulator: { control: 'peak-current', senseGain: 0.1, rampSlope: 35e3 },
	feedback: { vref: 0.8, r1: 10000 },
	compensator: { kind: 'type2', target: { method: 'k-factor', crossoverHz: 30e3, phaseMarginDeg: 60 } }
};
const vmDoc = { ...cmDoc, modulator: { vramp: 1.5 }, compensator: { kind: 'type3', target: { method: 'k-factor', crossoverHz: 40e3, phaseMarginDeg: 60 } } };

function analyse(doc: unknown): AnalysisResponse {
	const r = analyzeDesign(doc);
	if ('error' in r) throw new Error(r.error.message);
	return r;
}
function verify(doc: unknown): Verification {
	const v = verifyDesign(doc);
	if ('error' in v) throw new Error(v.error.message);
	return v as Verification;
}

describe('control method in the exports', { timeout: 60_000 }, () => {
	const cm = analyse(cmDoc);
	const f = cm.features.currentMode!;

	it('the current loop figures match the published formulas: Sn = Ri·(Vg − V)/L, mc = 1 + Se/Sn, Qp = 1/(π(mc·D′ − 0.5))', () => {
		// [published: Ridley 1991; E&M ch. 12] with D = V/Vg = 0.417: Sn = 70 kV/s, mc = 1.5, Qp = 0.857.
		// The engine's duty carries the DCR and RDS(on) drops (2 A × 25 mΩ of 7 V), under 1 % here.
		expect(f.sn / 70e3).toBeCloseTo(1, 1);
		expect(Math.abs(f.mc / 1.5 - 1)).toBeLessThan(0.01);
		expect(Math.abs(f.qp! / (1 / (Math.PI * (1.5 * (7 / 12) - 0.5))) - 1)).toBeLessThan(0.02);
	});

	it('the sign-off PDF names peak current mode with Ri, Se, mc, Qp and the Gvc pole; voltage mode names its ramp', async () => {
		const pdf = await buildSignoffPdf({ rail: { name: '5V0_CM' }, revision: { label: 'r1' }, document: cmDoc as never, response: cm, verification: verify(cmDoc) });
		const text = flat((await pdfText(pdf)).text);
		expect(text).toContain(`Peak current mode: Ri 100 mV/A, Se 35 kV/s, mc ${f.mc.toFixed(2)}, Qp ${f.qp!.toFixed(2)} (current loop damped)`);
		expect(text).toContain('Gvc low-frequency pole');
		expect(text).toContain('Current loop');
		expect(text).not.toContain('Vramp');

		const vm = analyse(vmDoc);
		const vmText = flat((await pdfText(await buildSignoffPdf({ rail: { name: '5V0_VM' }, revision: { label: 'r1' }, document: vmDoc as never, response: vm, verification: verify(vmDoc) }))).text);
		expect(vmText).toContain('Voltage mode: Vramp 1.5 V p-p');
		expect(vmText).not.toContain('Peak current mode');
	});

	it("the exported plot's legend calls the plant Gvc in peak current mode and Gvd in voltage mode", () => {
		const svg = renderBodeSvg(plotFromResponse(cm, { fswHz: 500e3 }));
		expect(svg).toContain('Plant Gvc');
		expect(svg).not.toContain('Gvd');
		expect(renderBodeSvg(plotFromResponse(analyse(vmDoc), { fswHz: 500e3 }))).toContain('Plant Gvd');
	});

	it('the SPICE netlist names the control method, Ri, Se, mc and Qp', () => {
		const out = spiceNetlist(cmDoc);
		if ('error' in out) throw new Error(out.error.message);
		expect(out.netlist).toMatch(/peak current mode, CCM/);
		expect(out.netlist).toMatch(/Ri = 0\.1 V\/A, Se = 35000 V\/s, Sn = [\d.e+]+ V\/s, mc = 1\.5\d*, Qp = 0\.8\d* \(damped\)/);
	});
});

describe('control-method words', () => {
	it('the modulator line and the plant label follow the method; a document without one is voltage mode', () => {
		expect(modulatorText({ vramp: 1, feedForward: true, delay: 1e-7 })).toBe('Voltage mode: Vramp 1 V p-p, input feed-forward, loop delay 100 ns');
		expect(modulatorText({ control: 'peak-current', vramp: 1, feedForward: false, delay: 0, senseGain: 0.25, rampSlope: 0 }, { mc: 1, qp: null, subharmonic: 'unstable' })).toBe(
			'Peak current mode: Ri 250 mV/A, Se 0 V/s, mc 1.00, Qp ∞ (subharmonic oscillation)'
		);
		expect(plantTraceLabel(undefined)).toBe('Plant Gvd');
		expect(plantTraceLabel('peak-current', true)).toBe('Plant Gvc (control voltage → vout)');
	});

	it('a template fits a rail of the same method only, and the refusal names the plant each was placed for', () => {
		expect(templateControlMismatch(undefined, 'voltage', 'R')).toBeNull();
		expect(templateControlMismatch('peak-current', 'peak-current', 'R')).toBeNull();
		expect(templateControlMismatch(undefined, 'peak-current', 'R')).toMatch(/placed for voltage mode and R uses peak current mode.*LC double pole.*single low-frequency pole/);
		expect(templateControlMismatch('peak-current', undefined, 'R')).toMatch(/placed for peak current mode and R uses voltage mode/);
	});
});

describe('the note beside the compensator choice', () => {
	// Type II is the usual network under peak current mode, Type III under voltage mode with an LC double pole [common practice].
	it('speaks only for a Type III under peak current mode', () => {
		expect(networkNoteForControl('peak-current', 'type3')).toMatch(/Type II is the usual network.*LC double pole/);
		for (const kind of ['type1', 'type2', 'type2-ota']) expect(networkNoteForControl('peak-current', kind)).toBeNull();
		for (const kind of ['type1', 'type2', 'type3']) expect(networkNoteForControl('voltage', kind)).toBeNull();
	});
});
