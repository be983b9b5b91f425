/**
 * The growth suggestion against the sample scene's true grades: a confusion table (true grade
 * rows × suggested grade columns) as Markdown for the README. `--fit` also prints the cuts that
 * `calibrate` fits to the scene. Needs the tiles: node geodata/generate-tiles.js.
 */
import { measureSceneFacets } from '../geodata/tile-reader';
import {
	calibrate,
	DEFAULT_GROWTH_THRESHOLDS,
	suggestGrade
} from '../src/lib/estimating/growth-suggest';
import { GROWTH_GRADES } from '../src/lib/estimating/types';
import { confusionTable } from '../geodata/growth-confusion';

const facets = await measureSceneFacets();
if (process.argv.includes('--verbose')) {
	for (const f of facets) {
		const s = suggestGrade(f.measures);
		console.log(
			f.facetId.padEnd(8),
			f.truth,
			s.grade,
			f.material.padEnd(16),
			f.measures.score.toFixed(3),
			s.confidence
		);
	}
}
if (process.argv.includes('--fit')) {
	const c = calibrate(facets.map((f) => ({ score: f.measures.score, grade: f.truth })));
	console.log('fitted cuts', c.thresholds.cuts.map((x) => x.toFixed(4)).join(', '), c);
}
const pairs = facets.map((f) => ({ truth: f.truth, suggested: suggestGrade(f.measures).grade }));
const exact = pairs.filter((p) => p.truth === p.suggested).length;
const within = pairs.filter(
	(p) => Math.abs(GROWTH_GRADES.indexOf(p.truth) - GROWTH_GRADES.indexOf(p.suggested as never)) <= 1
).length;
console.log(confusionTable(pairs));
console.log(
	`\n${facets.length} facets, thresholds ${DEFAULT_GROWTH_THRESHOLDS.cuts.join(' / ')}: exact ${exact} (${Math.round((100 * exact) / facets.length)}%), within one grade ${within} (${Math.round((100 * within) / facets.length)}%)`
);
