import { GROWTH_GRADES } from '../src/lib/estimating/types';

/** True grade rows × suggested grade columns, as a Markdown table. */
export function confusionTable(pairs: ReadonlyArray<{ truth: string; suggested: string }>) {
	const rows = GROWTH_GRADES.map((t) =>
		GROWTH_GRADES.map((s) => pairs.filter((p) => p.truth === t && p.suggested === s).length)
	);
	const head = `| true \\ suggested | ${GROWTH_GRADES.join(' | ')} |`;
	const rule = `| --- |${GROWTH_GRADES.map(() => ' ---: |').join('')}`;
	const body = GROWTH_GRADES.map((t, i) => `| ${t} | ${rows[i].join(' | ')} |`);
	return [head, rule, ...body].join('\n');
}
