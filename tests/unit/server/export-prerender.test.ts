// The pre-render after a save: it draws the PNG (with the corners), the sign-off PDF and the SVG
// of the saved revision under the user's own pre-render name, one revision at a time per user;
// saves made meanwhile leave only the newest waiting, other users are not held up, and a failed
// drawing is logged and ends nothing else.
import { beforeEach, describe, expect, it, vi } from 'vitest';

const drawn: string[] = [];
const gates = new Map<string, () => void>();
/** Each drawing waits until the test releases its revision, so the order can be observed. */
const gate = (loopId: string) => new Promise<void>((resolve) => gates.set(loopId, resolve));

vi.mock('../../../src/lib/server/services/loops', () => ({
	get: async (_db: unknown, id: string) => (id === 'missing' ? null : { id, revision: 1, verification: null, design: {} })
}));
vi.mock('../../../src/lib/server/services/signoff', () => ({
	context: async () => ({ rail: { name: 'RAIL' } }),
	reportPdf: async (_db: unknown, row: { id: string }, owner: string) => void drawn.push(`pdf ${row.id} ${owner}`)
}));
vi.mock('../../../src/lib/server/services/plot-export', () => ({
	plotFile: async (owner: string, row: { id: string }, format: string, q: { corners?: string }, base: string) => {
		if (row.id === 'broken') throw new Error('the stored design cannot be analysed');
		if (format === 'png') await gate(row.id);
		drawn.push(`${format} ${row.id} ${owner} corners=${q.corners} ${base}`);
	}
}));

const { prerenderExports, prerenderPending } = await import('../../../src/lib/server/services/export-prerender');
const db = {} as never;
const settle = () => new Promise((r) => setTimeout(r, 5));
async function release(loopId: string) {
	await vi.waitFor(() => expect(gates.has(loopId)).toBe(true));
	gates.get(loopId)!();
	gates.delete(loopId);
	await settle();
}

beforeEach(() => {
	drawn.length = 0;
	gates.clear();
});

describe('prerenderExports', () => {
	it('draws the PNG, the PDF and the SVG of the saved revision under the user’s pre-render name, without being awaited', async () => {
		expect(prerenderExports(db, 'r1', 'u1')).toBeUndefined();
		expect(prerenderPending('u1')).toBe(true);
		await release('r1');
		expect(drawn).toEqual(['png r1 prerender:u1 corners=1 RAIL-r1', 'pdf r1 prerender:u1', 'svg r1 prerender:u1 corners=1 RAIL-r1']);
		expect(prerenderPending('u1')).toBe(false);
	});

	it('runs one revision at a time per user and keeps only the newest save waiting', async () => {
		prerenderExports(db, 'a', 'u2');
		prerenderExports(db, 'b', 'u2');
		prerenderExports(db, 'c', 'u2');
		// Another user is not held up by u2's queue.
		prerenderExports(db, 'x', 'u3');
		await release('x');
		expect(drawn.filter((d) => d.startsWith('png')).map((d) => d.split(' ')[1])).toEqual(['x']);
		await release('a');
		await release('c');
		expect(drawn.filter((d) => d.startsWith('png')).map((d) => d.split(' ')[1])).toEqual(['x', 'a', 'c']);
		expect(gates.has('b')).toBe(false);
		expect(prerenderPending('u2')).toBe(false);
	});

	it('logs a drawing that fails and goes on with the next waiting revision', async () => {
		const warn = vi.spyOn(console, 'warn').mockImplementation(() => {});
		prerenderExports(db, 'broken', 'u4');
		prerenderExports(db, 'missing', 'u4');
		await vi.waitFor(() => expect(prerenderPending('u4')).toBe(false));
		expect(warn).toHaveBeenCalledWith(expect.stringContaining('pre-render of broken skipped'));
		expect(drawn).toEqual([]);
		warn.mockRestore();
	});
});
