// Loads the bench fixtures written by reference/bench/generate.py (scipy on exact analytic loops).
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const DIR = join(dirname(fileURLToPath(import.meta.url)), 'fixtures');

export const fixture = (name: string) => readFileSync(join(DIR, name), 'utf8');

export interface ExpectedMargins {
	points: number;
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
	phaseCrossoverHz: number | null;
	crossovers: { freqHz: number; phaseMarginDeg: number }[];
	phaseCrossovers: { freqHz: number; gainMarginDb: number }[];
}

export interface ExpectedDeviation {
	points: number;
	model: { gain: number; esrZeroHz: number; f0Hz: number; q: number };
	band: { startHz: number; stopHz: number; points: number };
	magDb: { maxAbs: number; rms: number; atHz: number };
	phaseDeg: { maxAbs: number; rms: number; atHz: number };
}

export const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as {
	files: Record<string, ExpectedMargins & ExpectedDeviation>;
};
