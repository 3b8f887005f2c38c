/**
 * Input errors raised by engine functions when a design cannot be modelled. Each names the
 * design-document field it concerns (dotted path) so the contract layer can report it as
 * `{ error: { code: 'invalid-design', fields: { [field]: message } } }`.
 */
export class DesignInputError extends Error {
	readonly fields: Record<string, string>;
	constructor(fields: Record<string, string>, message?: string) {
		super(message ?? Object.entries(fields).map(([k, v]) => `${k}: ${v}`).join('; '));
		this.name = 'DesignInputError';
		this.fields = fields;
	}
}

export const isDesignInputError = (e: unknown): e is DesignInputError => e instanceof DesignInputError;

export interface EngineWarning {
	code: string;
	message: string;
}
