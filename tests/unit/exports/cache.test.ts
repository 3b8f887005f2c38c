// The kept exports stay bounded (hostile use: every signed-in user can ask for many files):
// at most 256 files and 64 MB, least recently used dropped first; an error answer and a file
// over 8 MB are never kept; a kept file is answered without drawing again, and a file being
// drawn is not drawn a second time.
import { describe, expect, it, vi } from 'vitest';
import { cachedExport, exportCacheSize, exportKey } from '../../../src/lib/server/exports/cache';

describe('export cache', () => {
	it('draws a file once per key and answers the kept one afterwards', async () => {
		const render = vi.fn(async () => Buffer.from('png bytes'));
		const key = exportKey({ plot: 'loop-1', theme: 'dark' });
		expect((await cachedExport(key, render)).toString()).toBe('png bytes');
		expect((await cachedExport(key, render)).toString()).toBe('png bytes');
		expect(render).toHaveBeenCalledTimes(1);
		// Another input (theme) is another file.
		await cachedExport(exportKey({ plot: 'loop-1', theme: 'light' }), render);
		expect(render).toHaveBeenCalledTimes(2);
	});

	it('answers a request for a file being drawn with that drawing, and draws again after a failure', async () => {
		let finish: (b: Buffer) => void = () => {};
		const render = vi.fn(() => new Promise<Buffer>((resolve) => (finish = resolve)));
		const key = exportKey({ plot: 'in-flight' });
		const first = cachedExport(key, render);
		const second = cachedExport(key, render);
		finish(Buffer.from('drawn once'));
		expect((await first).toString()).toBe('drawn once');
		expect((await second).toString()).toBe('drawn once');
		expect(render).toHaveBeenCalledTimes(1);

		const failing = vi.fn(async () => {
			throw new Error('pool busy');
		});
		const other = exportKey({ plot: 'fails' });
		await expect(Promise.all([cachedExport(other, failing), cachedExport(other, failing)])).rejects.toThrow('pool busy');
		expect(failing).toHaveBeenCalledTimes(1);
		expect((await cachedExport(other, async () => 'svg now')).toString()).toBe('svg now');
	});

	it('never keeps an error answer', async () => {
		const render = vi.fn(async () => ({ error: { code: 'analysis-too-costly', message: 'reduce the sweep' } }));
		const key = exportKey({ pdf: 'costly' });
		await cachedExport(key, render);
		await cachedExport(key, render);
		expect(render).toHaveBeenCalledTimes(2);
	});

	it('keeps at most 256 files and 64 MB, dropping the least recently used; never a file over 8 MB', async () => {
		const mb = Buffer.alloc(1024 * 1024);
		const first = exportKey({ n: 0 });
		await cachedExport(first, async () => mb);
		for (let n = 1; n < 100; n++) {
			// Touch the first file now and then: it stays the most recently used.
			if (n % 10 === 0) await cachedExport(first, async () => Buffer.from('redrawn'));
			await cachedExport(exportKey({ n }), async () => mb);
		}
		const size = exportCacheSize();
		expect(size.bytes).toBeLessThanOrEqual(64 * 1024 * 1024);
		expect(size.entries).toBeLessThanOrEqual(256);
		expect((await cachedExport(first, async () => Buffer.from('redrawn'))).length).toBe(mb.length);
		// The oldest untouched file was dropped.
		expect((await cachedExport(exportKey({ n: 1 }), async () => Buffer.from('redrawn'))).toString()).toBe('redrawn');

		for (let n = 0; n < 300; n++) await cachedExport(exportKey({ small: n }), async () => 'svg');
		expect(exportCacheSize().entries).toBe(256);

		const huge = Buffer.alloc(9 * 1024 * 1024);
		const render = vi.fn(async () => huge);
		await cachedExport(exportKey({ huge: 1 }), render);
		await cachedExport(exportKey({ huge: 1 }), render);
		expect(render).toHaveBeenCalledTimes(2);
	});
});
