// Reading the Estimates list's filters from the address bar (src/lib/schemas/estimate-list-filters.ts).
// Query strings are parsed by the WHATWG URL Standard's URLSearchParams ('+' is a space, '%20'
// decodes); a UUID is the RFC 9562 8-4-4-4-12 hex form.
import { describe, expect, it } from 'vitest';
import {
	estimateListSearch,
	readEstimateListFilters
} from '../../../src/lib/schemas/estimate-list-filters';

const read = (q: string) => readEstimateListFilters(new URLSearchParams(q));
const SITE = '0b7a5f3e-9c1d-4e2f-8a6b-3c4d5e6f7a8b';

describe('readEstimateListFilters', () => {
	it('reads every filter that fits', () => {
		expect(read(`status=sent&site=${SITE}&text=+Alder+Loop+&page=3`)).toEqual({
			filters: { status: 'sent', site: SITE, text: 'Alder Loop', page: 3 },
			ignored: []
		});
	});
	it('treats absent and empty fields as no filter, on page 1', () => {
		expect(read('')).toEqual({ filters: { page: 1 }, ignored: [] });
		expect(read('status=&site=&text=%20%20&page=')).toEqual({ filters: { page: 1 }, ignored: [] });
	});
	it('drops each field that does not fit, names it, and keeps the rest', () => {
		const got = read(`status=open&site=12&text=${'x'.repeat(201)}&page=0`);
		expect(got.filters).toEqual({ page: 1 });
		expect(got.ignored).toEqual(['status', 'site', 'search text', 'page number']);
		expect(read('page=2.5&status=paid')).toEqual({
			filters: { status: 'paid', page: 1 },
			ignored: ['page number']
		});
		expect(read('page=100001').ignored).toEqual(['page number']);
	});
});

describe('estimateListSearch', () => {
	it('writes the filters back in a fixed order, leaving out page 1 and empty ones', () => {
		expect(estimateListSearch({})).toBe('');
		expect(estimateListSearch({ text: 'alder' }, 1)).toBe('?text=alder');
		expect(estimateListSearch({ status: 'draft', site: SITE, text: 'a&b' }, 2)).toBe(
			`?text=a%26b&status=draft&site=${SITE}&page=2`
		);
	});
	it('round-trips through readEstimateListFilters', () => {
		const f = { status: 'ready' as const, site: SITE, text: 'Tidewater Ct', page: 4 };
		expect(read(estimateListSearch(f, f.page).slice(1)).filters).toEqual(f);
	});
});
