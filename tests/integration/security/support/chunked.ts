// An upload without a Content-Length (chunked) that pushes as fast as the server reads, for the body-limit
// tests of the dev server (integration) and the production build (e2e).
import { request } from 'node:http';

/**
 * Streams `total` bytes without a Content-Length (chunked), as fast as the server takes them,
 * until the answer arrives. `sent` is how much the server had let through by then.
 */
export function chunkedUpload(url: string, headers: Record<string, string>, total: number): Promise<{ status: number; body: string; sent: number }> {
	return new Promise((resolve, reject) => {
		let sent = 0;
		let answered = false;
		const req = request(url, { method: 'POST', headers: { origin: new URL(url).origin, 'transfer-encoding': 'chunked', ...headers } }, (res) => {
			answered = true;
			const parts: Buffer[] = [];
			res.on('data', (c: Buffer) => parts.push(c));
			// 'close' also covers an answer cut short: the test then sees what did arrive.
			res.on('close', () => {
				resolve({ status: res.statusCode ?? 0, body: Buffer.concat(parts).toString('utf8'), sent });
				req.destroy();
			});
		});
		req.on('error', () => undefined); // EPIPE / ECONNRESET once the server closes; judged by 'close' below
		req.on('close', () => {
			if (!answered) reject(new Error(`the connection closed after ${sent} bytes without an answer`));
		});
		const chunk = Buffer.alloc(64 * 1024, 'x');
		const pump = () => {
			while (!answered && sent < total) {
				sent += chunk.length;
				if (!req.write(chunk)) return void req.once('drain', pump);
			}
			if (!answered) req.end();
		};
		req.write('{"pad":"');
		pump();
	});
}
