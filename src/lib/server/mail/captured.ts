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

/** Envelopes read at once while searching newest first. */
const BATCH = 50;

/**
 * Captured messages, newest first, at most `limit`; with `to`, only those addressed to it (case
 * ignored). Envelope names sort by capture time, so the search reads newest first and stops early.
 * An absent folder means nothing was captured yet.
 */
export async function listCaptured(limit = 100, to?: string): Promise<CapturedMail[]> {
	let names: string[];
	try {
		names = await readdir(mailDir());
	} catch {
		return [];
	}
	const envelopes = names.filter((n) => n.endsWith('.json')).sort().reverse();
	const address = to?.trim().toLowerCase();
	const found: CapturedMail[] = [];
	for (let start = 0; start < envelopes.length && found.length < limit; start += BATCH) {
		const batch = await Promise.all(
			envelopes.slice(start, start + BATCH).map(async (name) => JSON.parse(await readFile(join(mailDir(), name), 'utf8')) as CapturedMail)
		);
		for (const mail of batch) if (!address || mail.to.some((r) => r.toLowerCase() === address)) found.push(mail);
	}
	return found.slice(0, limit).sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
}
