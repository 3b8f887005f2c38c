/**
 * Colours of exported plots and reports: the palette of the identity sheet (light "paper" and its dark twin), the
 * same values as the app's CSS tokens, written out because an exported file carries no stylesheet.
 */
export type ThemeName = 'light' | 'dark';

export interface Palette {
	page: string;
	panel: string;
	ink: string;
	muted: string;
	grid: string;
	mag: string;
	phase: string;
	comp: string;
	measured: string;
	pass: string;
	caution: string;
	fail: string;
}

export const PALETTES: Record<ThemeName, Palette> = {
	light: {
		page: '#f6f4ee',
		panel: '#fbfaf6',
		ink: '#1c2330',
		muted: '#5d6675',
		grid: '#e2ddd0',
		mag: '#0e6f68',
		phase: '#b4531a',
		comp: '#5b5f97',
		measured: '#2b2b2b',
		pass: '#2f7d32',
		caution: '#b7791f',
		fail: '#b42318'
	},
	dark: {
		page: '#0f141b',
		panel: '#151c25',
		ink: '#e6e9ef',
		muted: '#9aa4b4',
		grid: '#243040',
		mag: '#33c2b5',
		phase: '#f08a4b',
		comp: '#9ea3e6',
		measured: '#d0d0d0',
		pass: '#5cc062',
		caution: '#e3a844',
		fail: '#f0625a'
	}
};

/** The font every exported plot names; PNG rendering loads its TTF from an npm package (fonts.ts). */
export const PLOT_FONT_FAMILY = 'JetBrains Mono';
