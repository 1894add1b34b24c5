import { describe, expect, it } from 'vitest';
import { diffPriceBooks, type DiffItem } from './price-book-diff';

const item = (
	sku: string,
	listCents: number,
	costCents = 100,
	extra: Partial<DiffItem> = {}
): DiffItem => ({
	sku,
	description: `Item ${sku}`,
	kind: 'accessory',
	listCents,
	costCents,
	...extra
});

describe('diffPriceBooks', () => {
	it('sorts items into added, removed, changed and unchanged', () => {
		const before = [item('A', 1000), item('B', 2000), item('C', 3000), item('D', 4000)];
		const after = [
			item('E', 500),
			item('C', 3150),
			item('A', 1000),
			item('b', 2000, 90, { description: 'Item B' })
		];
		const diff = diffPriceBooks(before, after);
		expect(diff.added.map((i) => i.sku)).toEqual(['E']);
		expect(diff.removed.map((i) => i.sku)).toEqual(['D']);
		expect(diff.unchangedCount).toBe(1);
		// B matched as b, ignoring case: its cost changed from 100 to 90 ¢
		expect(diff.changed.map((c) => [c.sku, c.fields, c.listDeltaCents])).toEqual([
			['b', ['costCents'], 0],
			// C: 3150 − 3000 = 150 ¢
			['C', ['listCents'], 150]
		]);
	});

	it('notices a new description or kind at the same price', () => {
		const diff = diffPriceBooks(
			[item('A', 1000), item('B', 1000)],
			[item('A', 1000, 100, { description: 'Renamed' }), item('B', 1000, 100, { kind: 'setup' })]
		);
		expect(diff.changed.map((c) => c.fields)).toEqual([['description'], ['kind']]);
	});

	it('against no active version, everything is new', () => {
		const diff = diffPriceBooks([], [item('X', 1), item('Y', 2)]);
		expect(diff.added).toHaveLength(2);
		expect(diff.removed).toHaveLength(0);
		expect(diff.changed).toHaveLength(0);
	});
});
