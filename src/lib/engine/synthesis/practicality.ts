// Flags network parts that are awkward to build: resistors outside about 1 kΩ–1 MΩ (noise, leakage, op-amp
// loading) and capacitors below about 10 pF (comparable to pin and layout capacitance) or above about 10 µF
// (size, leakage) [common practice; docs/formulas.md §5.3 "practical limits"]. Pure checks; messages in plain words.
import type { NetworkParts } from './networks';
import { formatEng } from '../../units/format';

export interface PartWarning {
	code: 'resistor-out-of-range' | 'capacitor-out-of-range';
	part: string;
	message: string;
}

export const PRACTICAL_LIMITS = {
	resistorMin: 1e3,
	resistorMax: 1e6,
	capacitorMin: 10e-12,
	capacitorMax: 10e-6
} as const;

const RESISTOR_NAMES = ['r1', 'r2', 'r3', 'rb'];
const CAPACITOR_NAMES = ['c1', 'c2', 'c3'];

export function partWarnings(parts: NetworkParts): PartWarning[] {
	const out: PartWarning[] = [];
	const record = parts as unknown as Record<string, unknown>;
	for (const name of RESISTOR_NAMES) {
		const r = record[name];
		if (typeof r !== 'number') continue;
		if (r < PRACTICAL_LIMITS.resistorMin || r > PRACTICAL_LIMITS.resistorMax) {
			out.push({
				code: 'resistor-out-of-range',
				part: name,
				message:
					`${name.toUpperCase()} = ${formatOhms(r)} is outside the practical 1 kΩ–1 MΩ range` +
					(r < PRACTICAL_LIMITS.resistorMin
						? '; raise R1 (the other resistors scale up with it, the capacitors down).'
						: '; lower R1 so the network impedances come down.')
			});
		}
	}
	for (const name of CAPACITOR_NAMES) {
		const c = record[name];
		if (typeof c !== 'number') continue;
		if (c < PRACTICAL_LIMITS.capacitorMin || c > PRACTICAL_LIMITS.capacitorMax) {
			out.push({
				code: 'capacitor-out-of-range',
				part: name,
				message:
					`${name.toUpperCase()} = ${formatFarads(c)} is outside the practical 10 pF–10 µF range` +
					(c < PRACTICAL_LIMITS.capacitorMin
						? '; stray capacitance of this size will move the corner — lower R1 to raise the capacitors.'
						: '; raise R1 to bring the capacitors down.')
			});
		}
	}
	return out;
}

const formatOhms = (r: number) => formatEng(r, 'Ω');
const formatFarads = (c: number) => formatEng(c, 'F');
