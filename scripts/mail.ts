// Prints the messages the local fake SMTP server captured for one address, newest first: how
// whoever runs the checkout reads a confirmation or reset link in development, before they can
// sign in to see their own mail on /dev/mail. Reads MAIL_DIR (scripts/env.sh's default folder).
// Run: npm run -s mail -- you@example.com [count]
import { listCaptured, mailDir } from '../src/lib/server/mail/captured';

const [address, count = '3'] = process.argv.slice(2);
if (!address) {
	console.error('usage: npm run -s mail -- ADDRESS [COUNT]');
	process.exit(2);
}
const mails = await listCaptured(Math.max(1, Number(count) || 3), address);
if (mails.length === 0) console.log(`no captured mail to ${address} in ${mailDir()}`);
for (const mail of mails) console.log(`— ${mail.receivedAt}  ${mail.subject}\n  to ${mail.to.join(', ')}\n\n${mail.text}\n`);
