/**
 * A fit from a design document: validated and analysed once (parts as built, placement and
 * rounding are analyze's), fitted to the measurement, and the fitted values written back into a
 * copy of the document so it can be saved and verified like any design.
 */
import { analyzeValidatedDesign } from '../analyze';
import { contractError, zodFields, type ContractError } from '../contract/errors';
import { designDocumentSchema, type DesignDocument } from '../contract/designSchema';
import { loopSpecFromDetail } from '../corners/loopModel';
import { effectiveCapacitance } from '../plants/derating';
import { fitError, fitMeasurement, type FitError, type FitResult, type Measurement } from './fitMeasurement';
import { fitRequestSchema, type FitResponse } from './schema';

export interface FitDesignInput {
	document: unknown;
	measurement: Measurement;
	/** The request body (validated here with fitRequestSchema). */
	request: unknown;
	measuredKind: FitResponse;
	vin?: number;
	iout?: number;
}

export function fitDesign(input: FitDesignInput): FitResult | FitError | ContractError {
	const req = fitRequestSchema.safeParse(input.request);
	if (!req.success) return fitError(zodFields(req.error, [], '(body)'));
	const parsed = designDocumentSchema.safeParse(input.document);
	if (!parsed.success) return contractError(zodFields(parsed.error));
	const detail = analyzeValidatedDesign(parsed.data, { includeResponse: false, closedLoop: false, sections: false });
	if ('error' in detail) return detail;
	return fitMeasurement({
		document: detail.document,
		spec: loopSpecFromDetail(detail),
		measurement: input.measurement,
		request: req.data,
		measuredKind: input.measuredKind,
		vin: input.vin,
		iout: input.iout
	});
}

/** Typed capacitance whose derated value (dcBias, temperature class, ageing at Vout) is `target`. */
function typedForEffective(branch: DesignDocument['plant']['capacitors'][number], vout: number, target: number): number {
	// effective(c) is c times a factor that depends on c only through the DC-bias curve, and
	// weakly: a fixed-point iteration converges in a few steps.
	let c = branch.c * (target / effectiveCapacitance(branch.c, branch, vout).effective);
	for (let i = 0; i < 30; i++) {
		const next = c * (target / effectiveCapacitance(c, branch, vout).effective);
		if (Math.abs(next - c) <= 1e-12 * c) return next;
		c = next;
	}
	return c;
}

/**
 * The document with the fitted values in place of the typed ones (the input document as given,
 * so sections it left out stay left out). A fitted effective capacitance goes back through the
 * branch's derating so the next analysis derives the same effective value.
 */
export function fittedDocument(doc: DesignDocument, result: FitResult): DesignDocument {
	const out: DesignDocument = structuredClone(doc);
	for (const p of result.parameters) {
		switch (p.name) {
			case 'l': out.plant.inductor.l = p.fitted; break;
			case 'dcr': out.plant.inductor.dcr = p.fitted; break;
			case 'vramp': out.modulator.vramp = p.fitted; break;
			case 'senseGain': out.modulator.senseGain = p.fitted; break;
			case 'rampSlope': out.modulator.rampSlope = p.fitted; break;
			case 'delay': out.modulator.delay = p.fitted; break;
			case 'esr': case 'esl': out.plant.capacitors[p.branch ?? 0][p.name] = p.fitted; break;
			case 'c': {
				const b = out.plant.capacitors[p.branch ?? 0];
				b.c = b.dcBias || b.tempClass || b.ageing ? typedForEffective(b, out.plant.vout, p.fitted) : p.fitted;
				break;
			}
		}
	}
	return out;
}

/** One line of provenance for the revision message: which file, which parameters, residual before → after. */
export function fitProvenance(result: FitResult, fileName: string): string {
	const names = result.parameters.map((p) => p.label).join(', ');
	const r = result.residual;
	return `Fitted ${names} to bench file ${fileName} (${result.response}, ${result.band.points} points): residual ${r.before.rmsDb.toFixed(2)} dB / ${r.before.rmsDeg.toFixed(1)}° rms → ${r.after.rmsDb.toFixed(2)} dB / ${r.after.rmsDeg.toFixed(1)}°`;
}
