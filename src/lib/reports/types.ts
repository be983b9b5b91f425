import type { EstimateStatus } from '../estimate-status';
import type { GrowthGrade, Material } from '../estimating/types';

/** What the reports read of one estimate: its frozen result, flattened. */
export interface EstimateFact {
	id: string;
	status: EstimateStatus;
	/** ISO date-time the estimate was saved. */
	createdAt: string;
	totalCents: number;
	preTaxCents: number;
	chemicalCents: number;
	labourCents: number;
	overheadCents: number;
	facets: {
		material: Material;
		growth: GrowthGrade;
		squares: number;
		priceCents: number;
		mixGal: number;
		labourHours: number;
	}[];
}

/** One version of a proposal as sent, with the customer's answer if any. */
export interface ProposalFact {
	estimateId: string;
	sentAt: string;
	decision: 'accepted' | 'declined' | null;
}

/** One job with what was expected (the estimate's figures) and what was logged. */
export interface JobFact {
	id: string;
	estimateId: string;
	label: string;
	done: boolean;
	/** The visit's date (YYYY-MM-DD), null while postponed without one. */
	date: string | null;
	doneAt: string | null;
	hoursExpected: number;
	hoursLogged: number | null;
	stockGalExpected: number;
	stockGalUsed: number | null;
	surfactantOzExpected: number;
	surfactantOzUsed: number | null;
}

/** One facet the imagery graded: what it suggested and what the estimator chose. */
export interface SuggestionFact {
	suggested: GrowthGrade;
	chosen: GrowthGrade;
}

export interface ReportFacts {
	estimates: EstimateFact[];
	proposals: ProposalFact[];
	jobs: JobFact[];
	suggestions: SuggestionFact[];
}
