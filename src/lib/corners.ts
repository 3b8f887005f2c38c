// The operating corners of a rail: Vin min/nom/max × Iout min/max (six cases), nominal first.
// Pure and shared by server and browser.

export interface RailOperatingRange {
	vinMin: number;
	vinNom: number;
	vinMax: number;
	ioutMin: number;
	ioutNom: number;
	ioutMax: number;
}

export interface Corner {
	vin: number;
	iout: number;
	/** e.g. "Vin nom, Iout max". */
	label: string;
}

export function railCorners(rail: RailOperatingRange): Corner[] {
	const vins = [
		['nom', rail.vinNom],
		['min', rail.vinMin],
		['max', rail.vinMax]
	] as const;
	const iouts = [
		['max', rail.ioutMax],
		['min', rail.ioutMin]
	] as const;
	const corners: Corner[] = [];
	for (const [vName, vin] of vins) {
		for (const [iName, iout] of iouts) corners.push({ vin, iout, label: `Vin ${vName}, Iout ${iName}` });
	}
	return corners;
}

/** One corner's stored analysis summary (Vin × Iout); `error` when the engine refused that corner. */
export interface CornerMetrics {
	corner: Corner;
	crossoverHz: number | null;
	phaseMarginDeg: number | null;
	gainMarginDb: number | null;
	closedLoopStable: boolean | null;
	/** The engine's warning codes at this corner. */
	warnings: string[];
	error?: string;
}
