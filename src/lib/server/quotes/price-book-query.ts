/**
 * The search of a price-book item list, read from URL parameters (`q`, `kind`, `page`). Pure and
 * forgiving: anything odd in the address falls back to "no filter" or page 1, never an error.
 */
import { LINE_KINDS, type LineKind } from './pricing';

export interface ItemQuery {
	/** searched in SKU and description; at most 100 characters */
	q: string;
	kind: LineKind | null;
	/** 1-based */
	page: number;
}

export function readItemQuery(params: URLSearchParams): ItemQuery {
	const q = (params.get('q') ?? '').trim().slice(0, 100);
	const kindText = (params.get('kind') ?? '').trim().toLowerCase();
	const kind = (LINE_KINDS as readonly string[]).includes(kindText) ? (kindText as LineKind) : null;
	const pageText = params.get('page') ?? '';
	const page = /^\d{1,6}$/.test(pageText) && Number(pageText) >= 1 ? Number(pageText) : 1;
	return { q, kind, page };
}
