// Notes and warnings name facets the way the estimator and the customer know them: the label
// given in the roof plan, or the facet's place in the plan ("Facet 2") when it has none — never
// the internal id, which is for software. (Clearpitch's own wording rule; no outside source.)
import { describe, expect, it } from 'vitest';
import { DEFAULT_RATE_CARD, estimate, tryEstimate } from '../../../src/lib/estimating';
import { facetName, facetNames, NoteCollector } from '../../../src/lib/estimating/notes';
import { facet, localPlane } from './fixtures';

const plane = localPlane(35.52, -74.46);

describe('facet names in notes', () => {
	it('uses the label given, or the place in the plan for an unlabelled facet', () => {
		expect(facetName({ label: 'Garage south slope' }, 0)).toBe('Garage south slope');
		expect(facetName({ label: '   ' }, 3)).toBe('Facet 4');
		expect(facetName({}, 1)).toBe('Facet 2');
		const names = facetNames([{ id: 'x-17' }, { id: 'k9', label: 'Porch' }, { id: 'x-17' }]);
		expect([...names]).toEqual([
			['x-17', 'Facet 1'],
			['k9', 'Porch']
		]);
	});

	it('lists the facets of a gathered note by name beside their ids', () => {
		const c = new NoteCollector(
			new Map([
				['a1', 'Facet 1'],
				['b2', 'Dormer']
			])
		);
		c.add('m', 'one', 'a1');
		c.add('m', 'one', 'b2');
		c.add('n', 'job-wide');
		expect(c.list()).toEqual([
			{ code: 'm', message: 'one', facetIds: ['a1', 'b2'], facets: ['Facet 1', 'Dormer'] },
			{ code: 'n', message: 'job-wide' }
		]);
	});

	it('names the facets of an estimate’s notes, not their ids', () => {
		const r = estimate(
			{
				facets: [
					facet({ id: 'f-0001', geometry: plane.rectFt(20, 20), material: 'metal' }),
					facet({ id: 'f-0002', geometry: plane.rectFt(20, 20, 40), growth: 'G3' }),
					facet({
						id: 'f-0003',
						label: 'Garage',
						geometry: plane.rectFt(20, 20, 80),
						material: 'metal',
						growth: 'G4'
					})
				]
			},
			DEFAULT_RATE_CARD
		);
		const metal = r.warnings.find((w) => w.code === 'material.metal');
		expect(metal?.facets).toEqual(['Facet 1', 'Garage']);
		expect(metal?.facetIds).toEqual(['f-0001', 'f-0003']);
		const lichen = r.expectations.find((e) => e.code === 'growth.lichen');
		expect(lichen?.facets).toEqual(['Facet 2', 'Garage']);
		for (const n of [...r.warnings, ...r.expectations]) expect(n.message).not.toMatch(/f-000/);
		expect(r.price.lineItems.filter((l) => l.code === 'facet').map((l) => l.label)).toEqual([
			'Facet 1',
			'Facet 2',
			'Garage'
		]);
	});

	it('names the facets of a too-weak-stock refusal by label', () => {
		const r = tryEstimate(
			{
				facets: [
					facet({ id: 'f-0001', geometry: plane.rectFt(20, 20), growth: 'G4' }),
					facet({ id: 'f-0002', label: 'Porch', geometry: plane.rectFt(20, 20, 40), growth: 'G4' })
				],
				stockStrengthPct: 0.5
			},
			DEFAULT_RATE_CARD
		);
		expect(r.ok).toBe(false);
		if (r.ok) return;
		const weak = r.issues.find((i) => i.code === 'stock_too_weak');
		expect(weak?.message).toMatch(/\(Facet 1, Porch\)$/);
		expect(weak?.message).not.toMatch(/f-000/);
	});
});
