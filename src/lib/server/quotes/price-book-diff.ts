/**
 * What a draft price book changes against the active one. Pure.
 * Items are matched by SKU ignoring letter case (the upload refuses SKUs that differ only in case).
 */
import type { LineKind } from './pricing';

export interface DiffItem {
	sku: string;
	description: string;
	kind: LineKind;
	/** cents */
	listCents: number;
	/** cents */
	costCents: number;
}

export interface ChangedItem {
	sku: string;
	before: DiffItem;
	after: DiffItem;
	/** which of the item's fields differ */
	fields: ('description' | 'kind' | 'listCents' | 'costCents')[];
	/** after − before list price, cents */
	listDeltaCents: number;
}

export interface PriceBookDiff {
	/** in the draft, not in the active version; by SKU */
	added: DiffItem[];
	/** in the active version, not in the draft; by SKU */
	removed: DiffItem[];
	/** in both, with a different description, kind, list price or cost; by SKU */
	changed: ChangedItem[];
	/** in both and identical */
	unchangedCount: number;
}

const bySku = (a: { sku: string }, b: { sku: string }) =>
	a.sku.toUpperCase() < b.sku.toUpperCase()
		? -1
		: a.sku.toUpperCase() > b.sku.toUpperCase()
			? 1
			: 0;

/** Compare a draft's items (`after`) with the active version's (`before`). */
export function diffPriceBooks(
	before: readonly DiffItem[],
	after: readonly DiffItem[]
): PriceBookDiff {
	const old = new Map(before.map((item) => [item.sku.toUpperCase(), item]));
	const added: DiffItem[] = [];
	const changed: ChangedItem[] = [];
	let unchangedCount = 0;
	for (const item of after) {
		const key = item.sku.toUpperCase();
		const previous = old.get(key);
		if (!previous) {
			added.push(item);
			continue;
		}
		old.delete(key);
		const fields = (['description', 'kind', 'listCents', 'costCents'] as const).filter(
			(field) => previous[field] !== item[field]
		);
		if (fields.length === 0) unchangedCount++;
		else
			changed.push({
				sku: item.sku,
				before: previous,
				after: item,
				fields: [...fields],
				listDeltaCents: item.listCents - previous.listCents
			});
	}
	return {
		added: added.sort(bySku),
		removed: [...old.values()].sort(bySku),
		changed: changed.sort(bySku),
		unchangedCount
	};
}
