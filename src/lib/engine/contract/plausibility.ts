/**
 * Plausibility of a design document's values: the schema's limits only keep the arithmetic
 * finite (an inductor may be up to 100 H), so a value far outside what switching regulators use
 * gets a warning naming the usual range — most often a unit typed wrong (µH read as H). Never an
 * error: an unusual design is still analysed. Ranges [common practice: switching regulators from
 * about a watt to a few kilowatts, the spans of catalogue parts and controller data sheets].
 */
import type { EngineWarning } from '../errors';
import type { UnitSymbol } from '../../units/quantities';
import { formatEng } from '../../units/format';
import type { DesignDocument } from './designSchema';

export const IMPLAUSIBLE_CODE = 'value-outside-usual-range';

interface UsualRange {
	/** Words for the kind of part ("switching-regulator inductors"). */
	what: string;
	unit: UnitSymbol;
	min: number;
	max: number;
}

/** The usual span of each value; `min: 0` means only the upper end is checked. */
export const USUAL_RANGES = {
	vin: { what: 'regulator input voltages', unit: 'V', min: 0.5, max: 1000 },
	vout: { what: 'regulator output voltages', unit: 'V', min: 0.3, max: 1000 },
	iout: { what: 'regulator load currents', unit: 'A', min: 1e-3, max: 300 },
	fsw: { what: 'switching frequencies', unit: 'Hz', min: 10e3, max: 10e6 },
	l: { what: 'power inductors', unit: 'H', min: 10e-9, max: 10e-3 },
	dcr: { what: 'inductor winding resistances', unit: 'Ω', min: 0, max: 1 },
	rdsOn: { what: 'power switch on-resistances', unit: 'Ω', min: 0, max: 1 },
	c: { what: 'output capacitors (per part)', unit: 'F', min: 1e-9, max: 0.1 },
	esr: { what: 'capacitor ESRs (per part)', unit: 'Ω', min: 0, max: 2 },
	esl: { what: 'capacitor ESLs (per part)', unit: 'H', min: 0, max: 20e-9 },
	vramp: { what: 'PWM ramp amplitudes', unit: 'V', min: 0.1, max: 10 },
	vref: { what: 'controller reference voltages', unit: 'V', min: 0.1, max: 5 },
	// A sense resistor of 1 mΩ…1 Ω times an amplifier gain of 1…20 [common practice].
	senseGain: { what: 'current-sense gains (sense resistance × amplifier gain)', unit: 'V/A', min: 1e-3, max: 20 }
} as const satisfies Record<string, UsualRange>;

function check(path: string, value: number, r: UsualRange): EngineWarning | null {
	if (value >= r.min && value <= r.max) return null;
	if (value === 0 && r.min === 0) return null;
	const span = r.min > 0 ? `${formatEng(r.min, r.unit)} to ${formatEng(r.max, r.unit)}` : `up to ${formatEng(r.max, r.unit)}`;
	return {
		code: IMPLAUSIBLE_CODE,
		message: `${path} = ${formatEng(value, r.unit, { digits: 4 })} is outside the usual ${span} of ${r.what}; check the value and its unit.`
	};
}

/** One warning per value outside its usual range, with the field's dotted path. */
export function plausibilityWarnings(d: DesignDocument): EngineWarning[] {
	const u = USUAL_RANGES;
	const p = d.plant;
	const items: [string, number, UsualRange][] = [
		['plant.vin', p.vin, u.vin],
		['plant.vout', p.vout, u.vout],
		['plant.iout', p.iout, u.iout],
		['plant.fsw', p.fsw, u.fsw],
		['plant.inductor.l', p.inductor.l, u.l],
		['plant.inductor.dcr', p.inductor.dcr, u.dcr],
		['plant.rdsOn', p.rdsOn, u.rdsOn],
		// The ramp amplitude matters in voltage mode only; peak current mode has its sense gain instead.
		d.modulator.control === 'peak-current' ? ['modulator.senseGain', d.modulator.senseGain ?? 0, u.senseGain] : ['modulator.vramp', d.modulator.vramp, u.vramp],
		['feedback.vref', d.feedback.vref, u.vref]
	];
	p.capacitors.forEach((b, i) => {
		items.push([`plant.capacitors.${i}.c`, b.c, u.c], [`plant.capacitors.${i}.esr`, b.esr, u.esr], [`plant.capacitors.${i}.esl`, b.esl, u.esl]);
	});
	return items
		.map(([path, value, range]) => check(path, value, range))
		.filter((w): w is EngineWarning => w !== null);
}
