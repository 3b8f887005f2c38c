// A tiny HTTP client for the integration tests: keeps one user's session cookie (or API
// token) and sends JSON with the app's own Origin, as a browser on the app's page would.
import { randomUUID } from 'node:crypto';
import { confirmationLink } from './mail';

export interface Reply<T = any> {
	status: number;
	body: T;
	/** The Location header of a redirect. */
	location?: string | null;
}

export class Client {
	cookie = '';
	token = '';
	/** Sent with every request (e.g. which instance a test load balancer should pick). */
	headers: Record<string, string> = {};
	constructor(readonly origin: string) {}

	async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<Reply<T>> {
		const init: RequestInit = {
			method,
			redirect: 'manual',
			headers: {
				origin: this.origin,
				...this.headers,
				...(body !== undefined ? { 'content-type': 'application/json' } : {}),
				...(this.cookie ? { cookie: this.cookie } : {}),
				...(this.token ? { authorization: `Bearer ${this.token}` } : {}),
				...headers
			},
			body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body)
		};
		const response = await fetch(this.origin + path, init);
		const cookies = response.headers.getSetCookie();
		if (cookies.length) this.cookie = mergeCookies(this.cookie, cookies);
		const text = await response.text();
		let parsed: unknown = text;
		try {
			parsed = text ? JSON.parse(text) : null;
		} catch {
			/* not JSON: keep the text */
		}
		return { status: response.status, body: parsed as T, location: response.headers.get('location') };
	}

	/** Posts an HTML form (urlencoded), as a browser without JavaScript would. */
	async form(path: string, fields: Record<string, string>): Promise<Reply<string> & { location: string | null }> {
		const response = await fetch(this.origin + path, {
			method: 'POST',
			redirect: 'manual',
			headers: { origin: this.origin, ...this.headers, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded', ...(this.cookie ? { cookie: this.cookie } : {}) },
			body: new URLSearchParams(fields).toString()
		});
		const cookies = response.headers.getSetCookie();
		if (cookies.length) this.cookie = mergeCookies(this.cookie, cookies);
		return { status: response.status, body: await response.text(), location: response.headers.get('location') };
	}

	/** Opens the confirmation link mailed to `email`, which confirms the address and signs this client in. */
	async confirm(email: string): Promise<Reply> {
		const link = await confirmationLink(email);
		const reply = await this.request('GET', link.pathname + link.search);
		if (reply.status !== 302) throw new Error(`confirmation link answered ${reply.status}`);
		return reply;
	}

	get = <T = any>(path: string) => this.request<T>('GET', path);
	post = <T = any>(path: string, body?: unknown) => this.request<T>('POST', path, body ?? {});
	patch = <T = any>(path: string, body?: unknown) => this.request<T>('PATCH', path, body ?? {});
	delete = <T = any>(path: string) => this.request<T>('DELETE', path);
}

function mergeCookies(current: string, setCookies: string[]): string {
	const jar = new Map(current.split('; ').filter(Boolean).map((c) => c.split('=') as [string, string]));
	for (const header of setCookies) {
		const [pair] = header.split(';');
		const eq = pair.indexOf('=');
		const name = pair.slice(0, eq);
		const value = pair.slice(eq + 1);
		if (value === '' || /max-age=0/i.test(header)) jar.delete(name);
		else jar.set(name, value);
	}
	return [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
}

export const PASSWORD = 'integration-pass-123';

export function uniqueEmail(label: string) {
	return `${label}-${randomUUID().slice(0, 8)}@example.test`;
}

/** Signs up a new user through better-auth's own endpoint and opens the mailed confirmation link; the client then holds the session. */
export async function signUp(origin: string, label: string): Promise<Client & { email: string; userId: string }> {
	const client = new Client(origin) as Client & { email: string; userId: string };
	client.email = uniqueEmail(label);
	const reply = await client.post('/api/auth/sign-up/email', { email: client.email, password: PASSWORD, name: `Test ${label}` });
	if (reply.status !== 200) throw new Error(`sign-up failed: ${reply.status} ${JSON.stringify(reply.body)}`);
	client.userId = reply.body.user.id;
	await client.confirm(client.email);
	return client;
}
