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
		text: `Hello ${name},\n\nSet a new password here (the link works once, for one hour): ${resetUrl}\n\nSetting it signs you out everywhere and revokes your API tokens; create new tokens afterwards for your scripts.\n\nIf you did not ask for this, ignore this message; your password stays as it is.\n`,
		html: `<p>Hello ${escapeHtml(name)},</p><p><a href="${escapeHtml(resetUrl)}">Set a new password</a> (the link works once, for one hour).</p><p>Setting it signs you out everywhere and revokes your API tokens; create new tokens afterwards for your scripts.</p>`
	};
}

export function verifyEmailMail(input: { to: string; name: string; verifyUrl: string }) {
	const { to, name, verifyUrl } = input;
	return {
		to,
		subject: 'Confirm your e-mail address for Loopwright',
		text: `Hello ${name},\n\nConfirm that this address is yours (the link works for 24 hours); it signs you in and takes you on: ${verifyUrl}\n\nIf you did not create a Loopwright account, ignore this message.\n`,
		html: `<p>Hello ${escapeHtml(name)},</p><p><a href="${escapeHtml(verifyUrl)}">Confirm your e-mail address</a> (the link works for 24 hours); it signs you in and takes you on.</p>`
	};
}

export function existingAccountMail(input: { to: string; name: string; signInUrl: string; resetUrl: string }) {
	const { to, name, signInUrl, resetUrl } = input;
	return {
		to,
		subject: 'You already have a Loopwright account',
		text: `Hello ${name},\n\nSomeone, maybe you, tried to create a Loopwright account with this address. You have one already: sign in at ${signInUrl}, or choose a new password at ${resetUrl}.\n\nIf it was not you, nothing changed and you need not do anything.\n`,
		html: `<p>Hello ${escapeHtml(name)},</p><p>Someone, maybe you, tried to create a Loopwright account with this address. You have one already: <a href="${escapeHtml(signInUrl)}">sign in</a>, or <a href="${escapeHtml(resetUrl)}">choose a new password</a>.</p><p>If it was not you, nothing changed and you need not do anything.</p>`
	};
}
