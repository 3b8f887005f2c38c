// The fake SMTP server's message reader against messages nodemailer itself encodes
// (quoted-printable, base64, RFC 2047 subjects, multipart/alternative): what goes in must
// come back out.
import nodemailer, { type SendMailOptions } from 'nodemailer';
import { describe, expect, it } from 'vitest';
import { decodeWords, parseMessage } from '../../../src/lib/server/mail/parse';

const composer = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'windows' });

async function raw(options: SendMailOptions): Promise<string> {
	const info = await composer.sendMail({ from: 'a@example.test', to: 'b@example.test', ...options });
	return (info.message as Buffer).toString('utf8');
}

describe('captured message reader', () => {
	it('reads a plain ASCII text message', async () => {
		const parsed = parseMessage(await raw({ subject: 'Reset your password', text: 'Line one\nLine two: http://127.0.0.1:3000/x?token=abc' }));
		expect(parsed).toEqual({ subject: 'Reset your password', text: 'Line one\nLine two: http://127.0.0.1:3000/x?token=abc' });
	});

	it('decodes non-ASCII subjects and quoted-printable bodies with long lines', async () => {
		const text = `Zoë invited you to “Café Works” – ${'µH and Ω '.repeat(20)}\nhttp://127.0.0.1:3000/invitations/${'a'.repeat(90)}`;
		const parsed = parseMessage(await raw({ subject: 'Zoë invited you to Café Works', text }));
		expect(parsed.subject).toBe('Zoë invited you to Café Works');
		expect(parsed.text).toBe(text.trimEnd());
	});

	it('takes the text part of a multipart/alternative message', async () => {
		const parsed = parseMessage(await raw({ subject: 'Both', text: 'plain body', html: '<p>html body</p>' }));
		expect(parsed.text).toBe('plain body');
	});

	it('decodes base64 text parts', async () => {
		const parsed = parseMessage(await raw({ subject: 'b64', text: '日本語のテキスト', textEncoding: 'base64' }));
		expect(parsed.text).toBe('日本語のテキスト');
	});

	it('decodes RFC 2047 words in both encodings [published: RFC 2047 §8 examples]', () => {
		expect(decodeWords('=?ISO-8859-1?Q?a?= b')).toBe('a b');
		expect(decodeWords('=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=')).toBe('ab');
		expect(decodeWords('=?ISO-8859-1?Q?a_b?=')).toBe('a b');
		expect(decodeWords('=?UTF-8?B?Q2Fmw6k=?=')).toBe('Café');
		expect(decodeWords('=?UTF-8?Q?Caf=C3=A9_Works?=')).toBe('Café Works');
	});
});
