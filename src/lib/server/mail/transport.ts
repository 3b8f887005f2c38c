// Sends e-mail through nodemailer. Development and tests talk plain SMTP to the local fake
// server (scripts/mail-fake.ts); production reads the relay's settings from the environment
// (SMTP_HOST, SMTP_PORT, SMTP_SECURE, SMTP_USER, SMTP_PASSWORD, MAIL_FROM).
import nodemailer, { type Transporter } from 'nodemailer';
import { isProduction, smtpSettings } from '../env';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html?: string;
}

let transporter: Transporter | null = null;

function transport(): Transporter {
	if (transporter) return transporter;
	const { host, port } = smtpSettings();
	const user = process.env.SMTP_USER;
	const secure = process.env.SMTP_SECURE === 'true';
	transporter = nodemailer.createTransport({
		host,
		port,
		secure,
		// The local fake speaks no TLS; a production relay negotiates STARTTLS unless told otherwise.
		ignoreTLS: !isProduction() && !secure,
		auth: user ? { user, pass: process.env.SMTP_PASSWORD ?? '' } : undefined
	});
	return transporter;
}

/** Sends one message; the promise rejects when the SMTP server refuses it. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
	await transport().sendMail({ from: smtpSettings().from, ...mail });
}
