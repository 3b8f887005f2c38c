/**
 * The theme's colours for drawing that CSS does not style (a canvas): read from the palette's
 * custom properties (`--lw-mag` …, src/app.css, defined on the root for each theme), so both
 * themes and any later palette change apply. Read once per theme: a computed-style read right
 * after a DOM update forces the browser to recompute styles there and then, which in a keystroke's
 * frame cost more than the drawing. Reading it inside an effect makes the effect run again when
 * the theme switches (the `data-theme` attribute of <html>, set by the theme toggle).
 */
import { createSubscriber } from 'svelte/reactivity';

const subscribe = createSubscriber((update) => {
	const observer = new MutationObserver(update);
	observer.observe(document.documentElement, { attributes: true, attributeFilter: ['data-theme'] });
	return () => observer.disconnect();
});

const cache = new Map<string, string>();

/** The value of each named custom property, e.g. `{ mag: '#0e6f68' }` for `{ mag: '--lw-mag' }`. */
export function themeColours<K extends string>(names: Record<K, string>): Record<K, string> {
	subscribe();
	const root = document.documentElement;
	const theme = root.dataset.theme ?? '';
	let style: CSSStyleDeclaration | null = null;
	const out = {} as Record<K, string>;
	for (const key in names) {
		const id = `${theme}|${names[key]}`;
		let value = cache.get(id);
		if (value === undefined) {
			style ??= getComputedStyle(root);
			value = style.getPropertyValue(names[key]).trim();
			// Not kept while the stylesheet has not applied yet (an empty value).
			if (value) cache.set(id, value);
		}
		out[key] = value;
	}
	return out;
}
