// Peak current-mode loops through /api/v1 against MariaDB: a buck and a boost saved and verified
// (the stored verdict carries the current-loop row, the report the current loop's figures and
// the control method in words), and templates that carry their control method: one placed for
// voltage mode does not fit a current-mode rail (and the reverse), and the answer says why.
import './support/env';
import { describe, expect, it } from 'vitest';
import { teamWithBoard } from './support/board';
import { buckDesign, currentModeBoostDesign, currentModeBuckDesign } from './support/designs';

const board = teamWithBoard('Current-mode board');
const newRail = (overrides: Record<string, unknown> = {}) => board.newRail('CM', overrides);
const saveLoop = (railId: string, design: unknown) => board.save(railId, design, { message: 'current mode' });
const BOOST_RAIL = { topology: 'boost', vout: 24, vinNom: 12, vinMin: 9, vinMax: 16, ioutNom: 1, ioutMin: 0.5, ioutMax: 1.5 };

describe('peak current-mode loops through the API', { timeout: 120_000 }, () => {
	it.each([
		['buck', {}, currentModeBuckDesign(), 12, 5],
		['boost', BOOST_RAIL, currentModeBoostDesign(), 12, 24]
	] as const)('a %s is saved, verified with a current-loop row, and its report names the control method with mc and Qp', async (topology, rail, design, vin, vout) => {
		const r = await newRail(rail);
		const saved = await saveLoop(r.id, design);
		const stored = (await board.team.as.viewer.get(`/api/v1/loops/${saved.id}`)).body;
		expect(stored.design.modulator).toMatchObject({ control: 'peak-current', senseGain: design.modulator.senseGain, rampSlope: design.modulator.rampSlope });
		const row = stored.verification.rows.find((x: { metric: string }) => x.metric === 'current-loop');
		expect(row, JSON.stringify(stored.verification.rows.map((x: { metric: string }) => x.metric))).toBeDefined();
		// The ramp is above (Sf − Sn)/2 at every input voltage of the rail: no subharmonic oscillation.
		expect(row.status).not.toBe('fail');

		const report = (await board.team.as.viewer.get(`/api/v1/loops/${saved.id}/report`)).body;
		const cm = report.modulator.currentMode;
		expect(report.modulator.control).toBe('peak-current');
		// Sn = Ri·m1 with the on-time slope m1 = (Vg − V)/L (buck) or Vg/L (boost), mc = 1 + Se/Sn,
		// Qp = 1/(π(mc·D′ − 0.5)) with the lossless duty [published: Ridley 1991; E&M ch. 12]. The
		// engine's duty carries the DCR and RDS(on) drops, a fraction of a percent here.
		const { l } = design.plant.inductor;
		const m1 = topology === 'buck' ? (vin - vout) / l : vin / l;
		const sn = design.modulator.senseGain * m1;
		const mc = 1 + design.modulator.rampSlope / sn;
		const dPrime = topology === 'buck' ? 1 - vout / vin : vin / vout;
		const qp = 1 / (Math.PI * (mc * dPrime - 0.5));
		expect(Math.abs(cm.sn / sn - 1)).toBeLessThan(0.02);
		expect(Math.abs(cm.mc / mc - 1)).toBeLessThan(0.02);
		expect(Math.abs(cm.qp / qp - 1)).toBeLessThan(0.05);
		expect(report.modulator.text).toBe(
			`Peak current mode: Ri ${design.modulator.senseGain === 0.1 ? '100 mV/A' : '50 mV/A'}, Se ${design.modulator.rampSlope === 35e3 ? '35 kV/s' : '50 kV/s'}, mc ${cm.mc.toFixed(2)}, Qp ${cm.qp.toFixed(2)} (current loop damped)`
		);
	});
});

describe('templates carry the control method', { timeout: 120_000 }, () => {
	it('a voltage-mode network refuses a current-mode rail and the reverse, saying why; same method applies; search finds the method', async () => {
		const { engineer, viewer } = board.team.as;
		const vmRail = await newRail();
		const vmLoop = await saveLoop(vmRail.id, buckDesign());
		const cmRail = await newRail();
		const cmLoop = await saveLoop(cmRail.id, currentModeBuckDesign());

		const vmTpl = await engineer.post(`/api/v1/loops/${vmLoop.id}/template`, { name: `VM Type III ${vmRail.name}` });
		const cmTpl = await engineer.post(`/api/v1/loops/${cmLoop.id}/template`, { name: `CM Type II ${cmRail.name}` });
		expect(vmTpl.status, JSON.stringify(vmTpl.body)).toBe(201);
		expect(cmTpl.body.compensator).toMatchObject({ kind: 'type2', control: 'peak-current', target: { method: 'k-factor', crossoverFraction: 0.06 } });
		expect(vmTpl.body.compensator).toMatchObject({ kind: 'type3', control: 'voltage' });

		const vmOnCm = await viewer.post(`/api/v1/templates/${vmTpl.body.id}/apply`, { railId: cmRail.id });
		expect(vmOnCm.status).toBe(422);
		expect(vmOnCm.body.error.code).toBe('control-mismatch');
		expect(vmOnCm.body.error.message).toMatch(/placed for voltage mode and .* uses peak current mode/);
		expect(vmOnCm.body.error.message).toMatch(/LC double pole.*single low-frequency pole.*Type III's double zero/);
		expect(vmOnCm.body.error.fields.railId).toBe('must be a voltage mode rail');

		const cmOnVm = await viewer.post(`/api/v1/templates/${cmTpl.body.id}/apply`, { railId: vmRail.id });
		expect(cmOnVm.status).toBe(422);
		expect(cmOnVm.body.error.code).toBe('control-mismatch');
		expect(cmOnVm.body.error.message).toMatch(/placed for peak current mode and .* uses voltage mode.*LC double pole/);

		// Same method: the Type II is re-placed on the other current-mode rail at fsw × 0.06 = 30 kHz;
		// K-factor places fc exactly with ideal parts [published: Venable 1983], E96/E12 rounding moves it a little.
		const other = await newRail();
		await saveLoop(other.id, { ...currentModeBuckDesign(), modulator: { control: 'peak-current', senseGain: 0.15, rampSlope: 50e3, delay: 0 } });
		const fits = await viewer.post(`/api/v1/templates/${cmTpl.body.id}/apply`, { railId: other.id });
		expect(fits.status, JSON.stringify(fits.body)).toBe(200);
		expect(Math.abs(fits.body.metrics.crossoverHz / 30_000 - 1)).toBeLessThan(0.1);
		expect(fits.body.design.modulator).toMatchObject({ control: 'peak-current', senseGain: 0.15 });

		const found = await viewer.get(`/api/v1/templates?workspace=${board.team.workspaceId}&q=${encodeURIComponent('peak current')}`);
		const names = found.body.items.map((t: { name: string }) => t.name);
		expect(names).toContain(cmTpl.body.name);
		expect(names).not.toContain(vmTpl.body.name);
	});
});
