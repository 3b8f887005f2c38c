/**
 * A loop reduced to the values that corners and Monte Carlo vary: the power stage input, the
 * modulator, the compensator parts as built, the op-amp model and the analysis range. Built
 * from analyze.ts's detailed result, so placement and rounding stay analyze's; rebuilt per
 * variant with powerStage + compensatorTf + modulatorTf (T = Gc·Fm·Gvd·e^(−sTd), docs/formulas.md §0).
 */
import type { AnalysisDetail } from '../analyze';
import { compensatorTf, type OpampModel } from '../compensators/transfer';
import { modulatorTf, type ModulatorInput } from '../plants/modulator';
import { controlledStage } from '../plants/controlledStage';
import type { PlantModel, PowerStageInput } from '../plants/types';
import type { NetworkParts } from '../synthesis/networks';
import { multiply } from '../tf/algebra';
import type { FactoredTf } from '../tf/types';
import { modulatorInputOf, stageInputOf, thermalOf } from '../pipeline/documentModel';
import type { ThermalModel } from '../plants/derating';

export interface LoopSpec {
	stage: PowerStageInput;
	modulator: ModulatorInput;
	/** Input voltage at which `modulator.vramp` is given (feed-forward scales from it). */
	vinNominal: number;
	parts: NetworkParts;
	opamp: OpampModel | null;
	/** Range for the margin search, Hz. */
	rangeHz: { startHz: number; stopHz: number };
	/** How the stage moves with temperature (absent: it does not). */
	thermal?: ThermalModel;
}

export interface BuiltLoop {
	plant: PlantModel;
	compensator: FactoredTf;
	modulator: FactoredTf;
	loop: FactoredTf;
}

export function buildLoop(spec: LoopSpec): BuiltLoop {
	const plant = controlledStage(spec.stage, spec.modulator);
	const compensator = compensatorTf(spec.parts, spec.opamp);
	const modulator = modulatorTf(spec.modulator, spec.stage.vin, spec.vinNominal);
	return { plant, compensator, modulator, loop: multiply(compensator, modulator, plant.gvd) };
}

/** The loop spec of an analysed design (parts as built: rounded when a series was set). */
export function loopSpecFromDetail(detail: AnalysisDetail): LoopSpec {
	const d = detail.document;
	const p = d.plant;
	const report = detail.compensator.rounded ?? detail.compensator.ideal;
	const rec = report.parts;
	const kind = detail.compensator.kind;
	const rb = rec.rb ?? null;
	let parts: NetworkParts;
	switch (kind) {
		case 'type1':
			parts = { kind, r1: rec.r1, rb, c1: rec.c1 };
			break;
		case 'type2':
			parts = { kind, r1: rec.r1, rb, r2: rec.r2, c1: rec.c1, c2: rec.c2 };
			break;
		case 'type3':
			parts = { kind, r1: rec.r1, rb, r2: rec.r2, r3: rec.r3, c1: rec.c1, c2: rec.c2, c3: rec.c3 };
			break;
		case 'type2-ota':
			parts = { kind, r1: rec.r1, rb, gm: rec.gm, r2: rec.r2, c1: rec.c1, c2: rec.c2 };
			if (rec.ro !== undefined) parts.ro = rec.ro;
			break;
	}
	return {
		stage: stageInputOf(d),
		modulator: modulatorInputOf(d),
		vinNominal: p.vin,
		parts,
		opamp: d.compensator.opamp ?? null,
		rangeHz: { ...detail.response.metrics.analysedRangeHz },
		thermal: thermalOf(d)
	};
}
