// plainCopy makes a worker message out of data that may sit behind proxies (Svelte's state):
// the structured clone of postMessage refuses a proxy, the copy is the same data without one.
import { describe, expect, it } from 'vitest';
import { plainCopy } from '$lib/design/plainCopy';

describe('plainCopy', () => {
	it('copies nested plain data read through a proxy, which the structured clone refuses [published: HTML structured clone algorithm, DataCloneError for a Proxy]', () => {
		const data = { plant: { vin: 12, capacitors: [{ c: 4.7e-6, esr: 0.005 }] }, sweep: { freqHz: [10, 100, 1000] }, name: 'VDD', on: true, none: null };
		const proxied = new Proxy(data, {});
		expect(() => structuredClone(proxied)).toThrow();
		const copy = plainCopy(proxied);
		expect(() => structuredClone(copy)).not.toThrow();
		expect(copy).toEqual(data);
		expect(copy).not.toBe(data);
		expect(copy.plant.capacitors).not.toBe(data.plant.capacitors);
	});

	it('keeps a typed array as it is (postMessage copies it; it is never proxied)', () => {
		const f = new Float64Array([1, 2, 3]);
		expect(plainCopy({ f }).f).toBe(f);
	});
});
