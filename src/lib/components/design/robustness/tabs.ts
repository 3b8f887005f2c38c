/** The design screen's panels, in tab order: the loop's Bode plot first, then the robustness panels. */
export type PanelId = 'loop' | 'closed' | 'step' | 'corners' | 'spread' | 'filter' | 'switching';

export const PANELS: { id: PanelId; label: string }[] = [
	{ id: 'loop', label: 'Loop' },
	{ id: 'closed', label: 'Closed loop' },
	{ id: 'step', label: 'Step' },
	{ id: 'corners', label: 'Corners' },
	{ id: 'spread', label: 'Spread' },
	{ id: 'filter', label: 'Input filter' },
	{ id: 'switching', label: 'Switching check' }
];
