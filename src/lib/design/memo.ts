/**
 * A one-entry memo: the last result, reused while every key is the same (`Object.is`, so an
 * object key such as an analysis is compared by identity). The design screen's panels keep their
 * heavy result this way for the design snapshot they were computed for.
 */
export function lastValueMemo<K extends readonly unknown[], V>(): (keys: K, compute: () => V) => V {
	let last: { keys: K; value: V } | null = null;
	return (keys, compute) => {
		if (last && last.keys.length === keys.length && last.keys.every((k, i) => Object.is(k, keys[i]))) return last.value;
		const value = compute();
		last = { keys, value };
		return value;
	};
}
