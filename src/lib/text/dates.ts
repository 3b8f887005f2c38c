/**
 * The one way a date and time is shown (screens, PDF, mail): "2 Dec 2026, 15:51 UTC". UTC and a
 * fixed English form, so a reviewer and an author in different places read the same moment and
 * server-rendered text matches what the browser shows.
 */
const DATE_TIME = new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit', hour12: false });

export function formatDateTime(value: Date | string | number | null | undefined, missing = '–'): string {
	if (value === null || value === undefined || value === '') return missing;
	const d = value instanceof Date ? value : new Date(value);
	if (Number.isNaN(d.getTime())) return missing;
	return `${DATE_TIME.format(d)} UTC`;
}
