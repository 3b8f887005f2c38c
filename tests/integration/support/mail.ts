// Waits for a message to an address in the fake SMTP server's folder (MAIL_DIR).
import { listCaptured, type CapturedMail } from '../../../src/lib/server/mail/captured';

export async function waitForMail(to: string, timeoutMs = 5000): Promise<CapturedMail> {
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		const found = (await listCaptured(500)).find((m) => m.to.includes(to));
		if (found) return found;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
}

export function firstLink(text: string): string {
	const match = /https?:\/\/\S+/.exec(text);
	if (!match) throw new Error(`no link in: ${text}`);
	return match[0];
}
