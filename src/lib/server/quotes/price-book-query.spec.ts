import { describe, expect, it } from 'vitest';
import { readItemQuery } from './price-book-query';

const read = (search: string) => readItemQuery(new URLSearchParams(search));

describe('readItemQuery', () => {
	it('reads search text, kind and page', () => {
		expect(read('q=+roller+&kind=Setup&page=3')).toEqual({ q: 'roller', kind: 'setup', page: 3 });
	});
	it('falls back to no filter and page 1 on anything odd', () => {
		expect(read('')).toEqual({ q: '', kind: null, page: 1 });
		expect(read('kind=spaceship&page=-2')).toEqual({ q: '', kind: null, page: 1 });
		expect(read('page=1e9')).toMatchObject({ page: 1 });
		expect(read('page=0')).toMatchObject({ page: 1 });
		expect(read(`q=${'x'.repeat(300)}`).q).toHaveLength(100);
	});
});
