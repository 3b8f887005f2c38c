/** Data the design screen's extra plots draw (the plots only draw; the engine computes). */
export interface FreqSeries {
	id: string;
	label: string;
	magDb: ArrayLike<number>;
	phaseDeg?: ArrayLike<number>;
	/** Stroke class (stroke-mag, stroke-phase, stroke-comp …). */
	cls: string;
	dash?: string;
	width?: number;
	opacity?: number;
}

export interface TimeSeries {
	id: string;
	label: string;
	/** Seconds from the step. */
	timeS: ArrayLike<number>;
	value: ArrayLike<number>;
	cls: string;
	dash?: string;
}
