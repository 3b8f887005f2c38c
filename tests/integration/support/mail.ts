// Reads the fake SMTP server's folder (MAIL_DIR): waits for a message to an address, and finds
// the confirmation link better-auth mails on sign-up, the one way every suite (integration,
// browser, load) completes a sign-up, exactly as a user does.
import { listCaptured, type CapturedMail } from '../../../src/lib/server/mail/captured';

/** The newest message to `to` whose subject matches `subject` (any subject when omitted). */
export async function waitForMail(to: string, subject?: RegExp, timeoutMs = 10_000): Promise<CapturedMail> {
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		const found = (await listCaptured(20, to)).find((m) => !subject || subject.test(m.subject));
		if (found) return found;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no mail to ${to}${subject ? ` matching ${subject}` : ''} within ${timeoutMs} ms`);
}

export function firstLink(text: string): string {
	const match = /https?:\/\/\S+/.exec(text);
	if (!match) throw new Error(`no link in: ${text}`);
	return match[0];
}

export const CONFIRMATION_SUBJECT = /^Confirm your e-mail address/;

/** The link of the newest confirmation mail to `email` (it confirms the address and signs the user in). */
export async function confirmationLink(email: string): Promise<URL> {
	return new URL(firstLink((await waitForMail(email, CONFIRMATION_SUBJECT)).text));
}
