// Reads the messages the local fake SMTP server captured (scripts/mail-fake.ts writes one
// `<id>.json` envelope and one `<id>.eml` per message into MAIL_DIR). Development and tests only.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { smtpSettings } from '../env';

export interface CapturedMail {
	id: string;
	receivedAt: string;
	from: string;
	to: string[];
	subject: string;
	text: string;
}

/** The folder the fake writes to: MAIL_DIR, else `.data/mail-<SMTP_PORT>` under the working directory. */
export function mailDir(): string {
	return process.env.MAIL_DIR || join(process.cwd(), '.data', `mail-${smtpSettings().port}`);
}

/** Captured messages, newest first. An absent folder means nothing was captured yet. */
export async function listCaptured(limit = 100): Promise<CapturedMail[]> {
	let names: string[];
	try {
		names = await readdir(mailDir());
	} catch {
		return [];
	}
	const envelopes = names.filter((n) => n.endsWith('.json')).sort().reverse().slice(0, limit);
	const mails = await Promise.all(
		envelopes.map(async (name) => JSON.parse(await readFile(join(mailDir(), name), 'utf8')) as CapturedMail)
	);
	return mails.sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
}
