// One HTTP POST from a chosen loopback source address (Linux routes all of 127.0.0.0/8 to the
// loopback device), so the app sees distinct clients: for the per-address limits' tests.
import { request } from 'node:http';

export interface Answer {
	status: number;
	text: string;
	headers: Record<string, string | string[] | undefined>;
}

/** One POST from the loopback address `from`, as a browser (form) or a script (JSON) would send it. */
export function postFromAddress(origin: string, from: string, path: string, kind: 'form' | 'json', fields: Record<string, string>, extra: Record<string, string> = {}): Promise<Answer> {
	const body = kind === 'form' ? new URLSearchParams(fields).toString() : JSON.stringify(fields);
	const url = new URL(path, origin);
	return new Promise((resolve, reject) => {
		const req = request(
			{
				host: url.hostname,
				port: url.port,
				path: url.pathname + url.search,
				method: 'POST',
				localAddress: from,
				headers: {
					origin,
					accept: kind === 'form' ? 'text/html' : 'application/json',
					'content-type': kind === 'form' ? 'application/x-www-form-urlencoded' : 'application/json',
					'content-length': Buffer.byteLength(body),
					...extra
				}
			},
			(res) => {
				let text = '';
				res.setEncoding('utf8');
				res.on('data', (chunk) => (text += chunk));
				res.on('end', () => resolve({ status: res.statusCode ?? 0, text, headers: res.headers }));
			}
		);
		req.once('error', reject);
		req.end(body);
	});
}

/**
 * A loopback address no earlier run used (the limits' counts live in the test database for their
 * window, so a fixed address would find the last run's count): 127.x.y.z, never 127.0.0.1.
 */
export function freshLoopback(): string {
	const byte = () => 1 + Math.floor(Math.random() * 254);
	return `127.${byte()}.${byte()}.${byte()}`;
}
