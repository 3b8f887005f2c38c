// The demo's history spread: order kept, every time in the past, on a weekday between 09:00 and
// 18:00 UTC, with gaps a person's day has (the rules of scripts/demo-history.ts, common practice
// for a believable record: no one saves a design at 03:00 on a Sunday in a demo).
import { describe, expect, it } from 'vitest';
import { movedTime, spreadTimes } from '../../../scripts/demo-history';

describe('demo history spread', () => {
	const now = new Date('2026-12-03T11:57:00Z'); // a Thursday
	for (const count of [0, 1, 40, 400]) {
		it(`${count} events: ordered, in the past, on working-day hours`, () => {
			const times = spreadTimes(count, now);
			expect(times).toHaveLength(count);
			for (let k = 0; k < times.length; k++) {
				const t = times[k];
				expect(t.getTime()).toBeLessThan(now.getTime());
				expect([0, 6]).not.toContain(t.getUTCDay());
				expect(t.getUTCHours()).toBeGreaterThanOrEqual(9);
				expect(t.getUTCHours()).toBeLessThan(18);
				if (k > 0) expect(t.getTime()).toBeGreaterThan(times[k - 1].getTime());
			}
		});
	}
	it('spreads a demo of ~40 events over more than a week, so the activity reads as days of work', () => {
		const times = spreadTimes(40, now);
		const span = times[39].getTime() - times[0].getTime();
		expect(span).toBeGreaterThan(7 * 86_400_000);
		expect(new Set(times.map((t) => t.toISOString().slice(0, 10))).size).toBeGreaterThan(5);
	});
});

describe('a seeded row moves with its action', () => {
	const actions = [1000, 2000, 3000];
	const moved = [new Date(0), new Date(3_600_000), new Date(7_200_000)];
	it('a stamp before an action keeps its distance to the first action at or after it', () => {
		expect(movedTime(1990, actions, moved).getTime()).toBe(3_600_000 - 10);
		expect(movedTime(2000, actions, moved).getTime()).toBe(3_600_000);
	});
	it('a stamp after the last action keeps its distance after it', () => {
		expect(movedTime(3050, actions, moved).getTime()).toBe(7_200_000 + 50);
	});
});
