// Maps database failures that callers can cause to API errors.
import { ApiError } from '../http/errors';

/** True for MariaDB's duplicate-key error (a unique index refused the row). */
export function isDuplicate(error: unknown): boolean {
	const e = error as { code?: string; errno?: number; cause?: { code?: string; errno?: number } };
	return e?.code === 'ER_DUP_ENTRY' || e?.errno === 1062 || e?.cause?.code === 'ER_DUP_ENTRY' || e?.cause?.errno === 1062;
}

/** Runs `write`; a duplicate key becomes 409 with the given field named. */
export async function uniqueOr409<T>(write: () => Promise<T>, field: string, message: string): Promise<T> {
	try {
		return await write();
	} catch (error) {
		if (isDuplicate(error)) throw new ApiError(409, 'conflict', message, { [field]: message });
		throw error;
	}
}
