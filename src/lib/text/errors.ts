/**
 * An API error as one sentence: the message, then only those field rules the message does not
 * already say (an import error printed its one rule twice: "… JSON (document.(document): … JSON").
 */
export function apiErrorText(error: { message?: string; fields?: Record<string, string> } | null | undefined, status: number): string {
	const message = error?.message ?? `HTTP ${status}`;
	const extra = Object.entries(error?.fields ?? {}).filter(([, rule]) => !message.includes(rule));
	return extra.length ? `${message} (${extra.map(([k, v]) => `${k}: ${v}`).join('; ')})` : message;
}
