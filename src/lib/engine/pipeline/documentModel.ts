/**
 * The design document mapped to the models' inputs, in one place: the model folders (plants/,
 * compensators/, corners/, spread/) never see the document. analyze.ts, the corners' loop spec,
 * the closed-loop section and every screen that moves a design to another operating point use
 * these.
 */
import { UNUSED_VRAMP, type DesignDocument, type DesignDocumentInput } from '../contract/designSchema';
import { operatingCases } from '../corners/operatingCases';
import { isDesignInputError } from '../errors';
import { modulatorTf, rampAmplitude, type ModulatorInput } from '../plants/modulator';
import { controlledStage } from '../plants/controlledStage';
import type { PowerStageInput } from '../plants/types';
import { multiply } from '../tf/algebra';
import type { FactoredTf } from '../tf/types';
import { effectiveCapacitance, REFERENCE_TEMPERATURE_C, type EffectiveCapacitance, type ThermalModel } from '../plants/derating';

/**
 * Each capacitor branch's effective value per part (DC bias at Vout, temperature class at
 * temperatureC, ageing; plants/derating.ts) beside the typed one. Every analysis uses `effective`.
 */
export function capacitorDeratingOf(d: DesignDocument, temperatureC = REFERENCE_TEMPERATURE_C): EffectiveCapacitance[] {
	// The output capacitors of both the buck and the boost sit across Vout.
	return d.plant.capacitors.map((b) => effectiveCapacitance(b.c, b, d.plant.vout, temperatureC));
}

/** True when some branch carries derating data (the response then lists the effective values). */
export const hasDerating = (d: DesignDocument) => d.plant.capacitors.some((b) => b.dcBias || b.tempClass || b.ageing);

/**
 * What corners need to move a stage to another temperature: each branch's class code and the
 * switch resistance's coefficient (DCR follows copper). Data only, so a LoopSpec stays cloneable.
 */
export function thermalOf(d: DesignDocument): ThermalModel {
	return { tempClasses: d.plant.capacitors.map((b) => b.tempClass ?? null), rdsOnTempco: d.plant.rdsOnTempco ?? 0 };
}

/** The power stage of a validated document, at its nominal point (25 °C) or at another Vin / Iout. */
export function stageInputOf(d: DesignDocument, at?: { vin: number; iout: number }): PowerStageInput {
	const p = d.plant;
	const effective = capacitorDeratingOf(d);
	return {
		topology: p.topology,
		vin: at?.vin ?? p.vin,
		vout: p.vout,
		iout: at?.iout ?? p.iout,
		fswHz: p.fsw,
		l: p.inductor.l,
		dcr: p.inductor.dcr,
		rdsOn: p.rdsOn,
		capacitors: p.capacitors.map((c, i) => ({ c: effective[i].effective, esr: c.esr, esl: c.esl, count: c.count })),
		...(p.lightLoad ? { lightLoad: p.lightLoad } : {})
	};
}

/** The modulator of a validated document (vramp is the ramp at plant.vin). */
export function modulatorInputOf(d: DesignDocument): ModulatorInput {
	const m = d.modulator;
	const base = { vramp: m.vramp, feedForward: m.feedForward, delayS: m.delay };
	return m.control === 'peak-current' ? { ...base, currentMode: { senseGain: m.senseGain ?? 0, rampSlope: m.rampSlope ?? 0 } } : base;
}

/**
 * The document moved to another operating point with a given compensator section: plant.vin and
 * plant.iout replaced, and the ramp given at the new vin (with feed-forward it follows Vin; the
 * rule is rampAmplitude's, plants/modulator.ts).
 */
export function operatingPointDocument(
	doc: DesignDocumentInput,
	at: { vin: number; iout: number },
	compensator: DesignDocumentInput['compensator']
): DesignDocumentInput {
	const mod = { vramp: doc.modulator.vramp ?? UNUSED_VRAMP, feedForward: doc.modulator.feedForward ?? false, delayS: doc.modulator.delay ?? 0 };
	return {
		...doc,
		plant: { ...doc.plant, vin: at.vin, iout: at.iout },
		modulator: { ...doc.modulator, vramp: rampAmplitude(mod, at.vin, doc.plant.vin) },
		compensator
	};
}

/**
 * Fm·Gvd at every operating case of the document's corners except the nominal (for placement
 * for the worst corner); a case the model cannot reach (duty limit) is left out: the verdict
 * reports it.
 */
export function cornerPlantLoops(d: DesignDocument): FactoredTf[] {
	const mod = modulatorInputOf(d);
	const cases = operatingCases({ vin: d.plant.vin, iout: d.plant.iout, vinRange: d.corners?.vin, ioutRange: d.corners?.iout });
	const out: FactoredTf[] = [];
	for (const c of cases) {
		if (c.nominal) continue;
		try {
			out.push(multiply(modulatorTf(mod, c.vin, d.plant.vin), controlledStage(stageInputOf(d, c), mod).gvd));
		} catch (e) {
			if (!isDesignInputError(e)) throw e;
		}
	}
	return out;
}
