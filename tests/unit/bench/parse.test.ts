import { describe, expect, it } from 'vitest';
import { benchMetrics, parseBenchFile, type BenchData } from '$lib/bench';
import { expected, fixture } from './fixtures';

function parsed(text: string, options = {}): BenchData {
	const r = parseBenchFile(text, options);
	if (!r.ok) throw new Error(`unexpected errors: ${JSON.stringify(r.errors)}`);
	return r.data;
}

describe('parseBenchFile: formats analyzers write', () => {
	it('comma file with a preamble: finds the header on line 6, Hz / dB / deg, ignores the extra column', () => {
		const d = parsed(fixture('buck-type3-loop.csv'));
		expect(d.format.separator).toBe(',');
		expect(d.format.headerLine).toBe(6);
		expect(d.format.columns.frequency).toMatchObject({ index: 1, unit: 'Hz' });
		expect(d.format.columns.gain).toMatchObject({ index: 2, unit: 'dB' });
		expect(d.format.columns.phase).toMatchObject({ index: 3, unit: 'deg' });
		expect(d.freqHz.length).toBe(expected.files['buck-type3-loop.csv'].points);
		// The file wraps into (−180°, 180°]; the loop has phase below −180° above ~480 kHz [scipy, reference/bench]
		expect(d.format.unwrapJumps).toBeGreaterThan(300);
		expect(Math.min(...d.phaseDeg)).toBeLessThan(-180);
		// Phase continuous: no step above 30° between neighbours at 50 points/decade [scipy curve is smooth]
		for (let i = 1; i < d.phaseDeg.length; i++) expect(Math.abs(d.phaseDeg[i] - d.phaseDeg[i - 1])).toBeLessThan(30);
	});

	it('semicolon file with decimal comma, kHz, linear |T|, radians, high-to-low sweep reads as the same data', () => {
		const eu = parsed(fixture('buck-type3-loop-eu.csv'));
		const us = parsed(fixture('buck-type3-loop.csv'));
		expect(eu.format).toMatchObject({ separator: ';', decimalComma: true, reversed: true, headerLine: 1 });
		expect(eu.format.columns.frequency.unit).toBe('kHz');
		expect(eu.format.columns.gain.unit).toBe('linear');
		expect(eu.format.columns.phase.unit).toBe('rad');
		expect(eu.freqHz.length).toBe(us.freqHz.length);
		for (let i = 0; i < us.freqHz.length; i++) {
			// both files hold the same scipy values, rounded to 7 significant digits / 6 decimals of a radian
			expect(eu.freqHz[i] / us.freqHz[i]).toBeCloseTo(1, 6);
			expect(eu.magDb[i]).toBeCloseTo(us.magDb[i], 3);
			expect(eu.phaseDeg[i]).toBeCloseTo(us.phaseDeg[i], 2);
		}
	});

	it('tab file with a comment line and "/"-style units (f/Hz, Magnitude/dB, Phase/°)', () => {
		const d = parsed(fixture('boost-type2-loop.tsv'));
		expect(d.format.separator).toBe('\t');
		expect(d.format.headerLine).toBe(2);
		expect(d.format.columns.phase.unit).toBe('deg');
		expect(d.format.unwrapJumps).toBe(0); // written unwrapped
		expect(d.freqHz[0]).toBe(10);
	});

	it('starts the unwrapped phase in (−270°, 90°]: a file written as +270° reads as −90°', () => {
		const d = parsed('Frequency (Hz),Gain (dB),Phase (deg)\n10,40,270\n20,34,269\n');
		expect(d.phaseDeg).toEqual([-90, -91]);
	});

	it("'inverted' phase reference: ∠(−T) readings lose 180°", () => {
		const d = parsed('Frequency (Hz),Gain (dB),Phase (deg)\n10,40,90\n20,34,89\n', { phaseReference: 'inverted' });
		expect(d.phaseDeg).toEqual([-90, -91]);
	});

	it('notes a unit the header omits and the column it did not use', () => {
		const d = parsed('Frequency,Gain,Phase,Gain 2\n1,2,3,4\n2,2,3,4\n');
		expect(d.notes.join(' ')).toMatch(/read as Hz/);
		expect(d.notes.join(' ')).toMatch(/read as dB/);
		expect(d.notes.join(' ')).toMatch(/read as degrees/);
		expect(d.notes.join(' ')).toMatch(/Gain 2/);
	});

	it('honours unit and column overrides', () => {
		const d = parsed('Frequency,Ch A,Phase,Ch B\n1,2,0.5,10\n2,2,0.25,100\n', {
			columns: { gain: 'ch b' },
			units: { frequency: 'kHz', gain: 'linear', phase: 'rad' }
		});
		expect(d.freqHz).toEqual([1000, 2000]);
		expect(d.magDb[1]).toBeCloseTo(40, 12); // 20·log10(100) [common practice]
		expect(d.phaseDeg[0]).toBeCloseTo((0.5 * 180) / Math.PI, 12);
	});
});

describe('parseBenchFile: errors name the line and the column', () => {
	const header = 'Frequency (Hz);Gain (dB);Phase (deg)';
	const errorsOf = (text: string, options = {}) => {
		const r = parseBenchFile(text, options);
		if (r.ok) throw new Error('expected errors');
		return r.errors;
	};

	it('a non-numeric cell', () => {
		const e = errorsOf(`${header}\n10;1,5;-90\n20;abc;-91\n`);
		expect(e).toEqual([{ line: 3, column: 2, columnName: 'Gain (dB)', message: '"abc" is not a number' }]);
	});

	it('a missing cell', () => {
		const e = errorsOf(`${header}\n10;1;-90\n20;1\n`);
		expect(e[0]).toMatchObject({ line: 3, column: 3, columnName: 'Phase (deg)' });
		expect(e[0].message).toMatch(/missing value/);
	});

	it('a negative and a zero frequency', () => {
		const e = errorsOf(`${header}\n-10;1;-90\n0;1;-91\n`);
		expect(e[0]).toMatchObject({ line: 2, column: 1 });
		expect(e[0].message).toMatch(/negative frequency/);
		expect(e[1]).toMatchObject({ line: 3, column: 1 });
		expect(e[1].message).toMatch(/> 0/);
	});

	it('a duplicate frequency and a row out of order', () => {
		const e = errorsOf(`${header}\n10;1;-90\n20;1;-91\n20;1;-92\n15;1;-93\n`);
		expect(e[0]).toMatchObject({ line: 4, column: 1 });
		expect(e[0].message).toMatch(/duplicate frequency 20 Hz \(also on line 3\)/);
		expect(e[1]).toMatchObject({ line: 5, column: 1 });
		expect(e[1].message).toMatch(/ascending order/);
	});

	it('no header with the three columns', () => {
		const e = errorsOf('Frequency (Hz),Gain (dB)\n10,1\n');
		expect(e[0]).toMatchObject({ line: null, column: null });
		expect(e[0].message).toMatch(/no header row/);
	});

	it('a linear gain that is not positive', () => {
		const e = errorsOf('Freq (Hz),|T| (V/V),Phase (deg)\n10,0,-90\n20,0.5,-91\n');
		expect(e[0]).toMatchObject({ line: 2, column: 2 });
	});

	it('a decimal comma in a comma-separated file is a separator problem, not a number', () => {
		const e = errorsOf('Frequency (Hz),Gain (dB),Phase (deg)\n10,"1,5",-90\n20,1,-91\n');
		expect(e[0]).toMatchObject({ line: 2, column: 2, message: '"1,5" is not a number' });
	});

	it('the size cap and the row cap', () => {
		const big = 'x'.repeat(5 * 1024 * 1024 + 1);
		expect(errorsOf(big)[0].message).toMatch(/larger than 5 MB/);
		const rows = Array.from({ length: 30 }, (_, i) => `${i + 1},0,-90`).join('\n');
		const e = errorsOf(`Frequency (Hz),Gain (dB),Phase (deg)\n${rows}`, { maxRows: 20 });
		expect(e[0]).toMatchObject({ line: 22 });
		expect(e[0].message).toMatch(/more than 20 data rows/);
	});

	it('lists at most maxErrors problems, then a count of the rest', () => {
		const rows = Array.from({ length: 50 }, (_, i) => `${i + 1},x,-90`).join('\n');
		const e = errorsOf(`Frequency (Hz),Gain (dB),Phase (deg)\n${rows}`, { maxErrors: 5 });
		expect(e).toHaveLength(6);
		expect(e[5].message).toBe('… and 45 more problems');
	});
});

describe('benchMetrics on the parsed fixtures vs scipy on the exact loop', () => {
	// Tolerances: the files sample 40–50 points/decade; interpolation between them on log f is what the
	// measurement allows. [scipy: reference/bench/generate.py, brentq on the exact function]
	for (const name of ['buck-type3-loop.csv', 'buck-type3-loop-eu.csv', 'boost-type2-loop.tsv']) {
		it(`${name}: every crossover and phase crossover, governing fc / PM / GM`, () => {
			const want = expected.files[name];
			const m = benchMetrics(parsed(fixture(name)));
			expect(m.crossovers).toHaveLength(want.crossovers.length);
			want.crossovers.forEach((c, i) => {
				expect(Math.abs(m.crossovers[i].freqHz / c.freqHz - 1), `crossover ${i} at ${c.freqHz} Hz`).toBeLessThan(0.005);
				expect(Math.abs(m.crossovers[i].phaseMarginDeg - c.phaseMarginDeg), `PM ${i}`).toBeLessThan(0.3);
			});
			expect(m.phaseCrossovers).toHaveLength(want.phaseCrossovers.length);
			want.phaseCrossovers.forEach((c, i) => {
				expect(Math.abs(m.phaseCrossovers[i].freqHz / c.freqHz - 1), `phase crossover ${i}`).toBeLessThan(0.005);
				expect(Math.abs(m.phaseCrossovers[i].gainMarginDb - c.gainMarginDb), `GM ${i}`).toBeLessThan(0.1);
			});
			expect(Math.abs(m.crossoverHz! / want.crossoverHz! - 1)).toBeLessThan(0.005);
			expect(Math.abs(m.phaseMarginDeg! - want.phaseMarginDeg!)).toBeLessThan(0.3);
			expect(Math.abs(m.gainMarginDb! - want.gainMarginDb!)).toBeLessThan(0.1);
			expect(Math.abs(m.phaseCrossoverHz! / want.phaseCrossoverHz! - 1)).toBeLessThan(0.005);
		});
	}

	it('a gain that never reaches 0 dB gives null margins with a reason', () => {
		const m = benchMetrics({ freqHz: [10, 100, 1000], magDb: [60, 40, 20], phaseDeg: [-90, -100, -120] });
		expect(m.crossoverHz).toBeNull();
		expect(m.phaseMarginDeg).toBeNull();
		expect(m.gainMarginDb).toBeNull();
		expect(m.notes.join(' ')).toMatch(/stays above 0 dB/);
	});

	it('hand check: 0 dB halfway in log f between 100 Hz and 10 kHz falls at 1 kHz [common practice: log interpolation]', () => {
		const m = benchMetrics({ freqHz: [100, 10000], magDb: [20, -20], phaseDeg: [-100, -140] });
		expect(m.crossoverHz).toBeCloseTo(1000, 9);
		expect(m.phaseMarginDeg).toBeCloseTo(60, 9);
	});
});
