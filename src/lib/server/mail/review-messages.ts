// The texts of the sign-off e-mails: a review request to each reviewer and the decision to
// the revision's author. Plain text first; the HTML part only adds the link.

function escapeHtml(value: string): string {
	return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

export interface RevisionRef {
	railName: string;
	revision: number;
	message: string;
}

const label = (r: RevisionRef) => `${r.railName} r${r.revision}`;

export function reviewRequestMail(input: { to: string; requesterName: string; loop: RevisionRef; note?: string | null; reviewUrl: string }) {
	const { to, requesterName, loop, note, reviewUrl } = input;
	const noteText = note ? `\n\nTheir note: ${note}` : '';
	return {
		to,
		subject: `Sign-off requested: ${label(loop)}`,
		text: `${requesterName} asks you to review loop ${label(loop)} ("${loop.message}").${noteText}\n\nOpen the review: ${reviewUrl}\n\nIt is also in your review queue in Loopwright.\n`,
		html: `<p>${escapeHtml(requesterName)} asks you to review loop <b>${escapeHtml(label(loop))}</b> (“${escapeHtml(loop.message)}”).</p>${note ? `<p>Their note: ${escapeHtml(note)}</p>` : ''}<p><a href="${escapeHtml(reviewUrl)}">Open the review</a></p>`
	};
}

export function reviewDecisionMail(input: { to: string; reviewerName: string; loop: RevisionRef; approved: boolean; note?: string | null; reviewUrl: string }) {
	const { to, reviewerName, loop, approved, note, reviewUrl } = input;
	const verb = approved ? 'approved' : 'asked for changes to';
	const next = approved
		? 'The revision is now locked; a further edit becomes a new revision that needs its own review.'
		: 'Save a new revision with the changes and request review again.';
	return {
		to,
		subject: `${approved ? 'Approved' : 'Changes requested'}: ${label(loop)}`,
		text: `${reviewerName} ${verb} loop ${label(loop)}.${note ? `\n\nNote: ${note}` : ''}\n\n${next}\n\nOpen the review: ${reviewUrl}\n`,
		html: `<p>${escapeHtml(reviewerName)} ${verb} loop <b>${escapeHtml(label(loop))}</b>.</p>${note ? `<p>Note: ${escapeHtml(note)}</p>` : ''}<p>${escapeHtml(next)}</p><p><a href="${escapeHtml(reviewUrl)}">Open the review</a></p>`
	};
}
