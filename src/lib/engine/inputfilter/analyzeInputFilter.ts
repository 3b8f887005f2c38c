/**
 * Input-filter check (docs/formulas.md §9): filter output impedance Zs against the converter's ZN and
 * ZD across frequency (Middlebrook's criterion |Zs| ≪ |ZN|, |ZD|, judged with a required margin
 * in dB [common practice: 6 dB]), the loop gain and margins with the filter in place, the
 * optimum damping for the chosen (or usual) ratios n = Cd/Cf, and a plain-words verdict.
 */
import { loopMetrics } from '../analysis/margins';
import type { PlantModel } from '../plants/types';
import { compileTf, lnMagPhaseAt } from '../tf/evaluate';
import type { FactoredTf } from '../tf/types';
import { bodeOf, type Bode } from '../closedloop/responses';
import { formatEng } from '../../units/format';
import {
	filterCorrection,
	filterFeatures,
	filterOutputImpedance,
	loopWithFilter,
	optimalDamping,
	peakImpedance,
	type InputFilter
} from './filter';

export interface InputFilterSettings {
	l: number;
	dcr?: number;
	c: number;
	damping?: { rd: number; cd: number } | { optimalRatio: number } | null;
	/** Required margin between |Zs| and both |ZN| and |ZD|, dB [6]. */
	marginDb?: number;
}

export interface LoopFigures {
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
	crossoverCount: number;
	closedLoopStable: boolean | null;
}

export interface InputFilterReport {
	r0: number;
	f0Hz: number;
	damping: { rd: number; cd: number } | null;
	/** Optimum damping for n = 1, 2, 4, 8 (and the chosen ratio, if any). */
	optimal: { n: number; rd: number; cd: number; qOpt: number; peakZs: number }[];
	peakZs: { value: number; freqHz: number };
	impedances: { freqHz: number[]; zsDb: number[]; znDb: number[]; zdDb: number[] };
	middlebrook: {
		requiredDb: number;
		/** min over the grid of 20·log10(|ZN|/|Zs|), and where. */
		marginNDb: number;
		marginNHz: number;
		marginDDb: number;
		marginDHz: number;
		pass: boolean;
	};
	loopWithFilter: Bode;
	withFilter: LoopFigures;
	withoutFilter: LoopFigures;
	verdict: { code: 'pass' | 'marginal' | 'fail'; message: string };
}

const LN_TO_DB = 20 / Math.LN10;

function figures(loop: FactoredTf, rangeHz: { startHz: number; stopHz: number }): LoopFigures {
	const m = loopMetrics(loop, rangeHz);
	return {
		crossoverHz: m.crossoverHz,
		phaseMarginDeg: m.phaseMarginDeg,
		gainMarginDb: m.gainMarginDb,
		crossoverCount: m.crossovers.length,
		closedLoopStable: m.closedLoopStable
	};
}

export interface MiddlebrookCheck {
	zs: FactoredTf;
	impedances: InputFilterReport['impedances'];
	middlebrook: InputFilterReport['middlebrook'];
}

/** The filter as a network (damping resolved: an optimal ratio becomes its Rd, Cd). */
function filterOf(settings: InputFilterSettings): { filter: InputFilter; ratios: number[] } {
	const ratios = [1, 2, 4, 8];
	let damping: { rd: number; cd: number } | null = null;
	if (settings.damping && 'optimalRatio' in settings.damping) {
		const o = optimalDamping(settings.l, settings.c, settings.damping.optimalRatio);
		damping = { rd: o.rd, cd: o.cd };
		if (!ratios.includes(settings.damping.optimalRatio)) ratios.push(settings.damping.optimalRatio);
	} else if (settings.damping) damping = { ...settings.damping };
	return { filter: { l: settings.l, dcr: settings.dcr ?? 0, c: settings.c, damping }, ratios };
}

/**
 * Middlebrook's criterion alone (§9): min over the grid of |ZN|/|Zs| and |ZD|/|Zs| in dB against
 * the required margin. Cheap enough to run at every corner (verify/).
 */
export function middlebrookCheck(settings: InputFilterSettings, plant: PlantModel, freqHz: ArrayLike<number>): MiddlebrookCheck {
	const zs = filterOutputImpedance(filterOf(settings).filter);
	const cs = compileTf(zs);
	const cn = compileTf(plant.zn);
	const cd = compileTf(plant.zd);
	const buf = new Float64Array(2);
	const db = (c: ReturnType<typeof compileTf>, f: number) => {
		lnMagPhaseAt(c, 2 * Math.PI * f, buf);
		return buf[0] * LN_TO_DB;
	};
	const grid = Array.from(freqHz);
	const zsDb = grid.map((f) => db(cs, f));
	const znDb = grid.map((f) => db(cn, f));
	const zdDb = grid.map((f) => db(cd, f));
	let mN = Infinity;
	let mNHz = grid[0];
	let mD = Infinity;
	let mDHz = grid[0];
	grid.forEach((f, i) => {
		if (znDb[i] - zsDb[i] < mN) {
			mN = znDb[i] - zsDb[i];
			mNHz = f;
		}
		if (zdDb[i] - zsDb[i] < mD) {
			mD = zdDb[i] - zsDb[i];
			mDHz = f;
		}
	});
	const requiredDb = settings.marginDb ?? 6;
	const pass = mN >= requiredDb && mD >= requiredDb;
	return {
		zs,
		impedances: { freqHz: grid, zsDb, znDb, zdDb },
		middlebrook: { requiredDb, marginNDb: mN, marginNHz: mNHz, marginDDb: mD, marginDHz: mDHz, pass }
	};
}

export function analyzeInputFilter(
	settings: InputFilterSettings,
	plant: PlantModel,
	loop: FactoredTf,
	freqHz: ArrayLike<number>,
	rangeHz: { startHz: number; stopHz: number }
): InputFilterReport {
	const { r0, f0Hz } = filterFeatures({ l: settings.l, c: settings.c });
	const { filter, ratios } = filterOf(settings);
	const damping = filter.damping ?? null;
	const { zs, impedances, middlebrook } = middlebrookCheck(settings, plant, freqHz);
	const peak = peakImpedance(zs, f0Hz / 100, f0Hz * 100);
	const grid = impedances.freqHz;
	const { requiredDb, marginNDb: mN, marginNHz: mNHz, marginDDb: mD, marginDHz: mDHz, pass } = middlebrook;

	const tWith = loopWithFilter(loop, filterCorrection(zs, plant.zn, plant.zd));
	const withFilter = figures(tWith, rangeHz);
	const withoutFilter = figures(loop, rangeHz);

	let verdict: InputFilterReport['verdict'];
	const minMargin = Math.min(mN, mD);
	if (withFilter.closedLoopStable === false) {
		verdict = { code: 'fail', message: 'With the input filter in place the closed loop is unstable: damp the filter or lower its output impedance.' };
	} else if (pass) {
		verdict = {
			code: 'pass',
			message: `|Zs| stays at least ${minMargin.toFixed(1)} dB below |ZN| and |ZD| (${requiredDb} dB required): the filter leaves the loop essentially unchanged.`
		};
	} else {
		verdict = {
			code: minMargin < 0 ? 'fail' : 'marginal',
			message: `|Zs| ${minMargin < 0 ? `rises ${(-minMargin).toFixed(1)} dB above` : `comes within ${minMargin.toFixed(1)} dB of`} ${mN < mD ? '|ZN|' : '|ZD|'} near ${formatEng(mN < mD ? mNHz : mDHz, 'Hz')} (${requiredDb} dB required); check the loop with the filter and consider more damping.`
		};
	}
	return {
		r0,
		f0Hz,
		damping,
		optimal: ratios.map((n) => ({ n, ...optimalDamping(settings.l, settings.c, n) })),
		peakZs: { value: peak.peak, freqHz: peak.freqHz },
		impedances,
		middlebrook,
		loopWithFilter: bodeOf(tWith, grid),
		withFilter,
		withoutFilter,
		verdict
	};
}

