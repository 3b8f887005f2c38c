// Local fake SMTP server for development and tests: accepts every message on
// 127.0.0.1:$SMTP_PORT (no auth required, no STARTTLS) and writes it to $MAIL_DIR as
// `<id>.eml` (raw) plus `<id>.json` (envelope, subject and plain-text body). Stops on SIGTERM/SIGINT.
// Run: npx tsx scripts/mail-fake.ts
import { mkdir, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { SMTPServer } from 'smtp-server';
import { mailDir } from '../src/lib/server/mail/captured';
import { parseMessage } from '../src/lib/server/mail/parse';

const port = Number(process.env.SMTP_PORT || 2525);
const host = '127.0.0.1';
const dir = mailDir();
await mkdir(dir, { recursive: true });

let counter = 0;
const server = new SMTPServer({
	authOptional: true,
	disabledCommands: ['STARTTLS'],
	logger: false,
	size: 5 * 1024 * 1024,
	onData(stream, session, callback) {
		const chunks: Buffer[] = [];
		stream.on('data', (chunk: Buffer) => chunks.push(chunk));
		stream.on('end', async () => {
			try {
				const raw = Buffer.concat(chunks).toString('utf8');
				const receivedAt = new Date().toISOString();
				// Sortable by time, unique within this process.
				const id = `${receivedAt.replace(/[-:.TZ]/g, '')}-${process.pid}-${String(++counter).padStart(4, '0')}`;
				const { subject, text } = parseMessage(raw);
				const envelope = {
					id,
					receivedAt,
					from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
					to: session.envelope.rcptTo.map((r) => r.address),
					subject,
					text
				};
				await writeFile(join(dir, `${id}.eml`), raw);
				// Written aside and renamed into place: a reader listing the folder never sees half an envelope.
				await writeFile(join(dir, `${id}.json.part`), JSON.stringify(envelope, null, 2));
				await rename(join(dir, `${id}.json.part`), join(dir, `${id}.json`));
				callback();
			} catch (error) {
				callback(error as Error);
			}
		});
	}
});

server.on('error', (error) => console.error('[mail-fake]', error.message));
server.listen(port, host, () => console.log(`[mail-fake] listening on ${host}:${port}, writing to ${dir}`));

function stop() {
	server.close(() => process.exit(0));
	// Open client connections must not keep the process alive.
	setTimeout(() => process.exit(0), 2000).unref();
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
