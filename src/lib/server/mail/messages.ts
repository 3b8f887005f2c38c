// The texts of the e-mails Loopwright sends. Plain text first (it reads well in any client);
// the HTML part only adds a clickable link.

function escapeHtml(value: string): string {
	return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

export function invitationMail(input: { to: string; workspaceName: string; inviterName: string; role: string; acceptUrl: string }) {
	const { to, workspaceName, inviterName, role, acceptUrl } = input;
	return {
		to,
		subject: `${inviterName} invited you to ${workspaceName} on Loopwright`,
		text: `${inviterName} invited you to the workspace "${workspaceName}" as ${role}.\n\nAccept the invitation: ${acceptUrl}\n\nIf you did not expect this, ignore this message.\n`,
		html: `<p>${escapeHtml(inviterName)} invited you to the workspace <b>${escapeHtml(workspaceName)}</b> as ${escapeHtml(role)}.</p><p><a href="${escapeHtml(acceptUrl)}">Accept the invitation</a></p>`
	};
}

export function passwordResetMail(input: { to: string; name: string; resetUrl: string }) {
	const { to, name, resetUrl } = input;
	return {
		to,
		subject: 'Reset your Loopwright password',
		text: `Hello ${name},\n\nSet a new password here (the link works once, for one hour): ${resetUrl}\n\nIf you did not ask for this, ignore this message; your password stays as it is.\n`,
		html: `<p>Hello ${escapeHtml(name)},</p><p><a href="${escapeHtml(resetUrl)}">Set a new password</a> (the link works once, for one hour).</p>`
	};
}
