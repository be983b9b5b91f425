/** One problem with the input, shaped like a zod issue so the API can merge both kinds. */
export interface EstimateIssue {
	/** e.g. ['facets', 2, 'geometry'] */
	path: Array<string | number>;
	code: string;
	message: string;
}

/**
 * Thrown by estimate() when the input passes the request schema but the model still refuses it
 * (self-intersecting outline, roof access on fragile tile, stock weaker than the mix…).
 * The API answers 400 with every issue; none of these is a server fault.
 */
export class EstimateInputError extends Error {
	readonly issues: EstimateIssue[];
	constructor(issues: EstimateIssue[]) {
		super(
			issues.length === 1
				? `${pathToString(issues[0].path)}: ${issues[0].message}`
				: `${issues.length} problems with the estimate input: ` +
						issues.map((i) => `${pathToString(i.path)}: ${i.message}`).join('; ')
		);
		this.name = 'EstimateInputError';
		this.issues = issues;
	}
}

export const pathToString = (path: ReadonlyArray<string | number>): string => path.join('.');
