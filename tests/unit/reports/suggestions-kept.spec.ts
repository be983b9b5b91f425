// How often the growth grade suggested from the imagery is kept: a confusion table of suggested
// (rows) against chosen (columns), and the share kept = matching ÷ all. The table and the share
// are the standard confusion matrix and overall accuracy of a classifier (see e.g. scikit-learn's
// `confusion_matrix` and `accuracy_score`, https://scikit-learn.org/stable/modules/model_evaluation.html);
// every expected figure below is counted by hand from the listed facets.
import { describe, expect, it } from 'vitest';
import { suggestionsKept } from '../../../src/lib/reports/aggregate';
import { csvFigure, reportTables } from '../../../src/lib/reports/tables';
import type { SuggestionFact } from '../../../src/lib/reports/types';
import type { GrowthGrade } from '../../../src/lib/estimating/types';

const f = (suggested: GrowthGrade, chosen: GrowthGrade): SuggestionFact => ({ suggested, chosen });

// Eight facets: G1 suggested three times (kept twice, once changed to G2), G2 suggested twice
// (kept once, once changed to G3), G4 suggested three times (kept once, twice changed to G3).
const FACETS = [
	f('G1', 'G1'),
	f('G1', 'G2'),
	f('G1', 'G1'),
	f('G2', 'G2'),
	f('G2', 'G3'),
	f('G4', 'G3'),
	f('G4', 'G4'),
	f('G4', 'G3')
];

describe('suggestions kept', () => {
	it('counts each facet in its suggested row and chosen column, with the share kept', () => {
		const { rows, total } = suggestionsKept(FACETS);
		expect(rows).toEqual([
			{ suggested: 'G1', chosen: [0, 2, 1, 0, 0], facets: 3, kept: 2, keptPct: (2 / 3) * 100 },
			{ suggested: 'G2', chosen: [0, 0, 1, 1, 0], facets: 2, kept: 1, keptPct: 50 },
			{ suggested: 'G4', chosen: [0, 0, 0, 2, 1], facets: 3, kept: 1, keptPct: (1 / 3) * 100 }
		]);
		// Kept overall: 2 + 1 + 1 = 4 of 8.
		expect(total).toEqual({ chosen: [0, 2, 2, 3, 1], facets: 8, kept: 4, keptPct: 50 });
	});

	it('all kept is 100 %, none kept is 0 %, and no facets is no share at all', () => {
		expect(suggestionsKept([f('G0', 'G0'), f('G3', 'G3')]).total.keptPct).toBe(100);
		expect(suggestionsKept([f('G0', 'G1'), f('G3', 'G2')]).total).toEqual({
			chosen: [0, 1, 1, 0, 0],
			facets: 2,
			kept: 0,
			keptPct: 0
		});
		expect(suggestionsKept([])).toEqual({
			rows: [],
			total: { chosen: [0, 0, 0, 0, 0], facets: 0, kept: 0, keptPct: null }
		});
	});

	it('the report table carries the same counts, a total row and the CSV figures', () => {
		const t = reportTables({ estimates: [], proposals: [], jobs: [], suggestions: FACETS })[
			'growth-suggestions'
		];
		expect(t.columns.map((c) => c.label)).toEqual([
			'Suggested',
			'Chosen G0',
			'Chosen G1',
			'Chosen G2',
			'Chosen G3',
			'Chosen G4',
			'Facets',
			'Kept',
			'Kept %'
		]);
		expect(t.rows[1]).toEqual(['G2 moderate', 0, 0, 1, 1, 0, 2, 1, 50]);
		expect(t.total).toEqual(['All', 0, 2, 2, 3, 1, 8, 4, 50]);
		expect(csvFigure(t.rows[0][8], t.columns[8].kind)).toBe(66.67);
	});

	it('the table is empty (no total) when no facet carries a suggestion', () => {
		const t = reportTables({ estimates: [], proposals: [], jobs: [], suggestions: [] })[
			'growth-suggestions'
		];
		expect(t.rows).toEqual([]);
		expect(t.total).toBeUndefined();
	});
});
