// Request bodies are read up to their limit and no further. A declared Content-Length over the limit
// is refused before any byte is read; a body without one (chunked) is read chunk by chunk and refused
// as soon as it passes the limit. Either way the answer is 413 with the API's error body and nothing
// more is read: the connection closes shortly after the answer, so a 50 MB upload costs the server the
// limit, not 50 MB.
// adapter-node's BODY_SIZE_LIMIT (scripts/start.sh) stays the outer bound for every route.
import { BENCH_MAX_BYTES } from '../../bench';
import { ApiError, errorBody } from './errors';

/** Largest accepted JSON body. A design document with a custom sweep is a few hundred kB at most. */
export const MAX_BODY_BYTES = 1_000_000;

/** Bench uploads may carry a whole analyzer file (the route checks the exact 5 MB rule itself, multipart framing included). */
export const BENCH_BODY_BYTES = Math.ceil(BENCH_MAX_BYTES * 1.25);

/** The body limit of an API path: bench uploads, else the JSON limit. */
export function bodyLimitFor(path: string): number {
	return /^\/api\/v1\/rails\/[^/]+\/bench\/?$/.test(path) ? BENCH_BODY_BYTES : MAX_BODY_BYTES;
}

export const payloadTooLarge = (limit: number) => new ApiError(413, 'payload-too-large', `the body exceeds ${limit} bytes`);

/**
 * How long a refused body's connection stays open, unread, after the 413 went out. Node closes a
 * `connection: close` answer's socket as soon as the answer ends, and closing a socket that still holds
 * unread bytes makes the kernel send a reset, which can wipe the 413 from the client's buffers before it
 * reads it [common practice: HTTP servers linger before closing]. So the answer's bytes are sent at once
 * (content-length tells the client it has them all) and the answer ends, closing the socket, a moment later.
 */
export const LINGER_MS = 1500;

/** The 413 answer for a request whose body is refused: nothing more of the body is read, the connection closes after LINGER_MS. */
export function payloadTooLargeResponse(limit: number): Response {
	const bytes = new TextEncoder().encode(JSON.stringify(errorBody(payloadTooLarge(limit))));
	const headers = { 'content-type': 'application/json', 'content-length': String(bytes.byteLength), 'cache-control': 'no-store', connection: 'close' };
	const body = new ReadableStream<Uint8Array>({
		start(controller) {
			controller.enqueue(bytes);
			setTimeout(() => controller.close(), LINGER_MS).unref();
		}
	});
	return new Response(body, { status: 413, headers });
}

/**
 * The body's bytes, or null once more than `limit` arrived (at most one chunk past the limit is read).
 * The stream is then left unread, not cancelled: cancelling adapter-node's stream destroys the socket
 * before the 413 could be written (the 413's connection closes a moment later).
 */
export async function readBodyLimited(body: ReadableStream<Uint8Array> | null, limit: number): Promise<Uint8Array<ArrayBuffer> | null> {
	if (!body) return new Uint8Array(0);
	const reader = body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > limit) {
			reader.releaseLock();
			return null;
		}
		chunks.push(value);
	}
	return Buffer.concat(chunks, size);
}

/**
 * The request as the handlers will see it: unchanged when it declares a length within the limit (Node's
 * parser never delivers more than the declared length), otherwise read here within the limit and
 * replaced by a copy that holds the bytes. 'too-large' when the body passes the limit.
 */
export async function boundedRequest(request: Request, limit: number): Promise<Request | 'too-large'> {
	const declared = request.headers.get('content-length');
	if (declared !== null) return Number(declared) > limit ? 'too-large' : request;
	if (!request.body) return request;
	const bytes = await readBodyLimited(request.body, limit);
	if (bytes === null) return 'too-large';
	const headers = new Headers(request.headers);
	headers.delete('transfer-encoding');
	headers.set('content-length', String(bytes.byteLength));
	return new Request(request.url, { method: request.method, headers, body: bytes, signal: request.signal });
}
