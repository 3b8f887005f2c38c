// Minimal RFC 5322 / MIME reader for the messages our own nodemailer sends: finds the
// subject and the text/plain part, decoding quoted-printable, base64 and RFC 2047 words.
// Enough for the fake SMTP capture and tests, not a general mail parser.

function splitHeaders(raw: string): { headers: Map<string, string>; body: string } {
	const cut = raw.search(/\r?\n\r?\n/);
	const head = cut < 0 ? raw : raw.slice(0, cut);
	const body = cut < 0 ? '' : raw.slice(cut).replace(/^\r?\n\r?\n/, '');
	const headers = new Map<string, string>();
	// Unfold continuation lines, then split "Name: value".
	for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
		const colon = line.indexOf(':');
		if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
	}
	return { headers, body };
}

function decodeQuotedPrintable(text: string): string {
	const bytes: number[] = [];
	const joined = text.replace(/=\r?\n/g, '');
	for (let i = 0; i < joined.length; i++) {
		const hex = joined.slice(i + 1, i + 3);
		if (joined[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
			bytes.push(parseInt(hex, 16));
			i += 2;
		} else {
			bytes.push(...Buffer.from(joined[i], 'utf8'));
		}
	}
	return Buffer.from(bytes).toString('utf8');
}

function decodeBody(body: string, encoding: string | undefined): string {
	switch ((encoding ?? '').toLowerCase()) {
		case 'base64':
			return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
		case 'quoted-printable':
			return decodeQuotedPrintable(body);
		default:
			return body;
	}
}

/**
 * Decodes RFC 2047 encoded words such as `=?UTF-8?Q?Caf=C3=A9?=` (UTF-8 and ASCII charsets;
 * our own mail is UTF-8). Whitespace between two adjacent encoded words is dropped (§6.2).
 */
export function decodeWords(value: string): string {
	const word = /=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g;
	return value
		.replace(/(=\?[^?]+\?[QqBb]\?[^?]*\?=)\s+(?==\?[^?]+\?[QqBb]\?[^?]*\?=)/g, '$1')
		.replace(word, (_all, _charset, kind: string, data: string) =>
			kind.toUpperCase() === 'B' ? Buffer.from(data, 'base64').toString('utf8') : decodeQuotedPrintable(data.replace(/_/g, ' '))
		);
}

function textPart(headers: Map<string, string>, body: string): string | null {
	const type = headers.get('content-type') ?? 'text/plain';
	const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
	if (/^multipart\//i.test(type) && boundary) {
		for (const part of body.split(`--${boundary}`).slice(1)) {
			if (part.startsWith('--')) break;
			const inner = splitHeaders(part.replace(/^\r?\n/, ''));
			const found = textPart(inner.headers, inner.body);
			if (found !== null) return found;
		}
		return null;
	}
	if (/^text\/plain/i.test(type)) return decodeBody(body, headers.get('content-transfer-encoding'));
	return null;
}

export function parseMessage(raw: string): { subject: string; text: string } {
	const { headers, body } = splitHeaders(raw);
	return {
		subject: decodeWords(headers.get('subject') ?? ''),
		text: (textPart(headers, body) ?? '').replace(/\r\n/g, '\n').trimEnd()
	};
}
