/**
 * SI prefixes as typed and shown in Loopwright's inputs (engineering notation).
 * The one case rule, because SPICE reads suffixes case-insensitively (M = milli) while SI is
 * case-sensitive (M = mega): here `m` is milli, `M` is mega, and `MEG` (any case) is mega too.
 */

/** Prefix → power of ten. Case-sensitive except `MEG`, which is matched in any case. */
export const PREFIX_EXPONENT: Readonly<Record<string, number>> = {
	f: -15,
	p: -12,
	n: -9,
	N: -9, // SPICE habit; not an SI prefix, so it is unambiguous
	u: -6, // the ASCII stand-in for µ
	U: -6,
	'µ': -6, // U+00B5 micro sign
	'μ': -6, // U+03BC Greek small mu
	m: -3,
	k: 3,
	K: 3, // SPICE habit; not an SI prefix, so it is unambiguous
	M: 6,
	MEG: 6,
	G: 9,
	T: 12
};

/** Letters that mean different things in SI and SPICE; we refuse to guess. */
export const AMBIGUOUS_PREFIX: Readonly<Record<string, string>> = {
	P: "'P' is peta in SI but pico in SPICE: write p for pico"
};

/** The prefix shown for a power of ten (engineering steps of 3), µ and never u. */
export const DISPLAY_PREFIX: Readonly<Record<number, string>> = {
	[-15]: 'f',
	[-12]: 'p',
	[-9]: 'n',
	[-6]: 'µ',
	[-3]: 'm',
	0: '',
	3: 'k',
	6: 'M',
	9: 'G',
	12: 'T'
};

export const PREFIX_HELP = 'f p n µ (u) m k M (MEG) G T';
