// Property tests: whatever the bytes, the parser returns a result (no throw), every error names a line inside the
// file (or null) and a column inside the row, and accepted data are finite, ascending and positive in frequency.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { benchMetrics, parseBenchFile } from '$lib/bench';

const cellText = fc.oneof(
	fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }).map(String),
	fc.constantFrom('', 'abc', '1,5', '1e', '-', 'NaN', 'Infinity', '"2"', '1.2.3', ' 4 ', '1e400'),
	fc.string({ maxLength: 6 })
);

describe('parseBenchFile never crashes and always places its errors', () => {
	it('random rows under a valid header', () => {
		fc.assert(
			fc.property(
				fc.constantFrom(',', ';', '\t'),
				fc.array(fc.array(cellText, { minLength: 0, maxLength: 5 }), { maxLength: 40 }),
				(sep, rows) => {
					const text = ['Frequency (Hz)', 'Gain (dB)', 'Phase (deg)'].join(sep) + '\n' + rows.map((r) => r.join(sep)).join('\n');
					const lineCount = text.split('\n').length;
					const r = parseBenchFile(text);
					if (r.ok) {
						const { freqHz, magDb, phaseDeg } = r.data;
						expect(freqHz.length).toBeGreaterThanOrEqual(2);
						for (let i = 0; i < freqHz.length; i++) {
							expect(Number.isFinite(freqHz[i]) && Number.isFinite(magDb[i]) && Number.isFinite(phaseDeg[i])).toBe(true);
							expect(freqHz[i]).toBeGreaterThan(i > 0 ? freqHz[i - 1] : 0);
						}
						const m = benchMetrics(r.data);
						for (const v of [m.crossoverHz, m.phaseMarginDeg, m.gainMarginDb]) expect(v === null || Number.isFinite(v)).toBe(true);
					} else {
						expect(r.errors.length).toBeGreaterThan(0);
						for (const e of r.errors) {
							expect(e.message.length).toBeGreaterThan(0);
							if (e.line !== null) expect(e.line >= 2 && e.line <= lineCount).toBe(true);
							if (e.column !== null) expect(e.column >= 1 && e.column <= 3).toBe(true);
						}
					}
				}
			),
			{ numRuns: 300 }
		);
	});

	it('arbitrary text', () => {
		fc.assert(
			fc.property(fc.string({ maxLength: 400 }), (text) => {
				const r = parseBenchFile(text);
				expect(typeof r.ok).toBe('boolean');
			}),
			{ numRuns: 300 }
		);
	});

	it('a valid sweep with one corrupted cell reports exactly that line and column', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: 29 }), fc.integer({ min: 0, max: 2 }), (row, col) => {
				const rows = Array.from({ length: 30 }, (_, i) => [10 * 1.2 ** i, 40 - i, -90 - i].map(String));
				rows[row][col] = 'x1';
				const r = parseBenchFile('Frequency (Hz),Gain (dB),Phase (deg)\n' + rows.map((c) => c.join(',')).join('\n'));
				expect(r.ok).toBe(false);
				if (!r.ok) expect(r.errors[0]).toMatchObject({ line: row + 2, column: col + 1 });
			}),
			{ numRuns: 100 }
		);
	});
});
