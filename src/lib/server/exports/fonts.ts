/**
 * TTF files for server-side rendering (resvg draws text only from TTF/OTF; pdfkit embeds TTF), all resolved from
 * node_modules at run time, never bundled:
 * - JetBrains Mono (OFL-1.1, @expo-google-fonts/jetbrains-mono): values and the plot.
 * - DejaVu Sans (free licence, dejavu-fonts-ttf): the fallback for text a user typed in scripts and symbols
 *   JetBrains Mono and Helvetica lack (Greek, Cyrillic, Hebrew, Arabic, arrows, maths, dingbats) and the
 *   replacement glyph U+FFFD for characters no font here has.
 * - Noto Emoji (OFL-1.1, @expo-google-fonts/noto-emoji): monochrome emoji.
 */
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

export type FontWeight = 'regular' | 'bold';

export function jetBrainsMonoTtf(weight: FontWeight = 'regular'): string {
	const file =
		weight === 'bold' ? '700Bold/JetBrainsMono_700Bold.ttf' : '400Regular/JetBrainsMono_400Regular.ttf';
	return require.resolve(`@expo-google-fonts/jetbrains-mono/${file}`);
}

export function dejaVuSansTtf(weight: FontWeight = 'regular'): string {
	return require.resolve(`dejavu-fonts-ttf/ttf/${weight === 'bold' ? 'DejaVuSans-Bold.ttf' : 'DejaVuSans.ttf'}`);
}

export function notoEmojiTtf(weight: FontWeight = 'regular'): string {
	return require.resolve(`@expo-google-fonts/noto-emoji/${weight === 'bold' ? '700Bold/NotoEmoji_700Bold.ttf' : '400Regular/NotoEmoji_400Regular.ttf'}`);
}

/** Every font the plot rasteriser loads: the plot's own family first, then the fallbacks it picks per glyph. */
export function plotFontFiles(): string[] {
	return [jetBrainsMonoTtf('regular'), jetBrainsMonoTtf('bold'), dejaVuSansTtf('regular'), dejaVuSansTtf('bold'), notoEmojiTtf('regular')];
}
