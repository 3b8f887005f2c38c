/**
 * TTF files for server-side rendering (resvg draws text only from TTF/OTF; pdfkit embeds TTF). JetBrains Mono ships
 * as TTF in @expo-google-fonts/jetbrains-mono (OFL-1.1); resolved from node_modules at run time, never bundled.
 */
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

export function jetBrainsMonoTtf(weight: 'regular' | 'bold' = 'regular'): string {
	const file =
		weight === 'bold' ? '700Bold/JetBrainsMono_700Bold.ttf' : '400Regular/JetBrainsMono_400Regular.ttf';
	return require.resolve(`@expo-google-fonts/jetbrains-mono/${file}`);
}
