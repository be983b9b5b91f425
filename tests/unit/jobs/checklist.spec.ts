// The crew's checklist and the rule for closing a job (Clearpitch's own rule, from the issue:
// the whole checklist and at least one after photo, or a reason). The site steps follow the
// plant-protection order of the soft-wash guidance in docs (pre-wet before, cover, rinse after:
// UF extension, Peart; county stormwater programmes' power-washing guidance).
import { describe, expect, it } from 'vitest';
import {
	checkDone,
	checklistItems,
	MIN_REASON_LENGTH,
	unticked
} from '../../../src/lib/jobs/checklist';

const items = checklistItems([
	{ id: 'f1', n: 1 },
	{ id: 'f2', n: 2, label: 'North slope' }
]);
const all = Object.fromEntries(items.map((i) => [i.key, true]));

describe('checklist', () => {
	it('lists the site steps in order with one line per facet', () => {
		expect(items.map((i) => i.key)).toEqual([
			'prewet',
			'cover',
			'testspot',
			'facet:f1',
			'facet:f2',
			'rinse',
			'walkround'
		]);
		expect(items[4].label).toBe('Facet 2 (North slope) done');
	});

	it('counts only true ticks of known lines', () => {
		const left = unticked(items, { prewet: true, cover: false, bogus: true });
		expect(left.map((i) => i.key)).toEqual([
			'cover',
			'testspot',
			'facet:f1',
			'facet:f2',
			'rinse',
			'walkround'
		]);
	});
});

describe('checkDone', () => {
	it('closes with every line ticked and one after photo', () => {
		expect(checkDone({ items, log: { checklist: all }, afterPhotos: 1, reason: null })).toEqual({
			ok: true
		});
	});

	it('refuses a full checklist without a photo, naming what is missing', () => {
		expect(checkDone({ items, log: { checklist: all }, afterPhotos: 0, reason: '' })).toEqual({
			ok: false,
			missing: ['At least one after photo']
		});
	});

	it('refuses a photo without the checklist, naming each open line', () => {
		const r = checkDone({
			items,
			log: { checklist: { ...all, rinse: false } },
			afterPhotos: 2,
			reason: null
		});
		expect(r).toEqual({ ok: false, missing: ['Final rinse of plants, windows and paths'] });
	});

	it('closes with a reason of at least the minimum length, whatever is missing', () => {
		const reason = 'x'.repeat(MIN_REASON_LENGTH);
		expect(checkDone({ items, log: { checklist: {} }, afterPhotos: 0, reason })).toEqual({
			ok: true
		});
		const short = checkDone({ items, log: { checklist: {} }, afterPhotos: 0, reason: '  short  ' });
		expect(short.ok).toBe(false);
		// Spaces do not count towards a reason.
		const blank = checkDone({
			items,
			log: { checklist: {} },
			afterPhotos: 0,
			reason: ' '.repeat(40)
		});
		expect(blank.ok).toBe(false);
	});
});
