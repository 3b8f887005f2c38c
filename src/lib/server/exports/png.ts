/**
 * Bode plot as PNG: the exported SVG rasterised by resvg (@resvg/resvg-js, a prebuilt binary that arrives as an npm
 * optional dependency; no download step) with JetBrains Mono and its fallbacks loaded from npm TTFs and no system fonts, so the
 * picture is the same on every server.
 */
import { Resvg } from '@resvg/resvg-js';
import { renderBodeSvg, type BodeSvgOptions } from './bodeSvg';
import { plotFontFiles } from './fonts';
import type { ExportPlot } from './plotTypes';
import { PLOT_FONT_FAMILY } from './theme';

export interface PngOptions {
	/** Output width in pixels [the SVG's own width]; the height follows the aspect ratio. */
	pixelWidth?: number;
}

/** Rasterise any SVG string with the bundled fonts. */
export function svgToPng(svg: string, options: PngOptions = {}): Buffer {
	const resvg = new Resvg(svg, {
		fitTo: options.pixelWidth ? { mode: 'width', value: Math.round(options.pixelWidth) } : { mode: 'original' },
		font: {
			loadSystemFonts: false,
			// JetBrains Mono first; resvg takes a glyph it lacks from the fallbacks (DejaVu Sans, Noto Emoji).
			fontFiles: plotFontFiles(),
			defaultFontFamily: PLOT_FONT_FAMILY,
			monospaceFamily: PLOT_FONT_FAMILY
		}
	});
	return resvg.render().asPng();
}

export function renderBodePng(plot: ExportPlot, options: BodeSvgOptions & PngOptions = {}): Buffer {
	return svgToPng(renderBodeSvg(plot, options), options);
}
