/**
 * The words for the control method of a loop, in one place: its name, the modulator line of
 * the review page and the PDF, the plant trace's label, and why a template placed for one
 * method does not fit a rail of the other (docs/formulas.md §14).
 */
import { formatEng } from '$lib/units/format';

export type ControlMode = 'voltage' | 'peak-current';

export const CONTROL_MODE_LABEL: Record<ControlMode, string> = {
	voltage: 'Voltage mode',
	'peak-current': 'Peak current mode'
};

/** A missing control (documents and templates from before peak current mode) is voltage mode. */
export const controlOf = (c: string | null | undefined): ControlMode => (c === 'peak-current' ? 'peak-current' : 'voltage');

/**
 * The plant trace: the duty → vout response in voltage mode, the control voltage → vout response
 * (the current loop closed inside) in peak current mode. `long` adds the input and output in words.
 */
export function plantTraceLabel(control: ControlMode | null | undefined, long = false): string {
	if (controlOf(control) === 'voltage') return 'Plant Gvd';
	return long ? 'Plant Gvc (control voltage → vout)' : 'Plant Gvc';
}

interface ModulatorDoc {
	control?: string;
	vramp: number;
	feedForward: boolean;
	delay: number;
	senseGain?: number;
	rampSlope?: number;
}
interface CurrentLoopFigures {
	mc: number;
	qp: number | null;
	subharmonic: 'damped' | 'peaking' | 'unstable';
}

const SUBHARMONIC_WORDS: Record<CurrentLoopFigures['subharmonic'], string> = {
	damped: 'current loop damped',
	peaking: 'fsw/2 peaking',
	unstable: 'subharmonic oscillation'
};

/**
 * One line for the modulator: the control method first, then its values. Peak current mode
 * names Ri and Se (as given) and, from the analysis, mc and Qp of the fsw/2 pair.
 */
export function modulatorText(m: ModulatorDoc, cm?: CurrentLoopFigures | null): string {
	const delay = m.delay > 0 ? `, loop delay ${formatEng(m.delay, 's')}` : '';
	if (controlOf(m.control) === 'voltage') {
		return `${CONTROL_MODE_LABEL.voltage}: Vramp ${formatEng(m.vramp, 'V')} p-p${m.feedForward ? ', input feed-forward' : ''}${delay}`;
	}
	const bits = [`Ri ${formatEng(m.senseGain ?? 0, 'V/A')}`, `Se ${formatEng(m.rampSlope ?? 0, 'V/s')}`];
	if (cm) bits.push(`mc ${cm.mc.toFixed(2)}`, `Qp ${cm.qp === null ? '∞' : cm.qp.toFixed(2)} (${SUBHARMONIC_WORDS[cm.subharmonic]})`);
	return `${CONTROL_MODE_LABEL['peak-current']}: ${bits.join(', ')}${delay}`;
}

/**
 * Why a template placed for one control method does not fit a rail of the other, in plain words:
 * the network's zeros answer the plant it was placed against. Null when the methods agree.
 */
export function templateControlMismatch(templateControl: string | null | undefined, railControl: string | null | undefined, railName: string): string | null {
	const tpl = controlOf(templateControl);
	const railMode = controlOf(railControl);
	if (tpl === railMode) return null;
	if (tpl === 'voltage') {
		return (
			`the template was placed for voltage mode and ${railName} uses peak current mode. Its network answers a plant with the LC double pole ` +
			`(−40 dB/decade and up to 180° of phase lag at f0), which its zeros near f0 cancel; with the current loop closed the plant has a single ` +
			`low-frequency pole instead, so a Type III's double zero (or zeros placed relative to f0) would sit where nothing needs cancelling and ` +
			`lift the gain above the crossover toward the fsw/2 peak. Save a template from a peak current-mode rail (Type II is the usual network).`
		);
	}
	return (
		`the template was placed for peak current mode and ${railName} uses voltage mode. Its network answers a plant with a single ` +
		`low-frequency pole; a voltage-mode plant has the LC double pole at f0 (up to 180° of phase lag), which the template's single zero ` +
		`cannot lift back, so the loop would have little or no phase margin. Save a template from a voltage-mode rail (Type III is the usual network).`
	);
}

/**
 * A note beside the compensator choice when it does not suit the control method: with the
 * current loop closed the plant has one low-frequency pole, so a Type III's second zero has no
 * LC double pole to cancel. Null when the choice is the usual one (the form keeps the choice:
 * a Type III can still be placed on purpose, e.g. to cancel an output-filter pole).
 */
export function networkNoteForControl(control: ControlMode, kind: string): string | null {
	if (control !== 'peak-current' || kind !== 'type3') return null;
	return 'Peak current mode: the plant has one low-frequency pole, so a Type II is the usual network; a Type III’s second zero has no LC double pole to cancel.';
}
