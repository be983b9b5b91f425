import type { RateCard } from './rate-card';
import type { LabourLineItem, LabourResult } from './types';
import { fixed2, roundCents, shortNumber } from './money';
import { MIN_PER_HOUR } from './units';

export interface FacetLabourInput {
	squares: number;
	applications: number;
	productionSquaresPerHour: number;
	accessLabourMultiplier: number;
	storyLabourMultiplier: number;
	growthLabourFactor: number;
}

/** Crew hours to apply mix on one facet: squares × applications ÷ production × multipliers. */
export function applicationHours(f: FacetLabourInput): number {
	return (
		((f.squares * f.applications) / f.productionSquaresPerHour) *
		f.accessLabourMultiplier *
		f.storyLabourMultiplier *
		f.growthLabourFactor
	);
}

export const ladderHours = (placements: number, setupMinutes: number): number =>
	(placements * setupMinutes) / MIN_PER_HOUR;

export interface JobLabourInput {
	applicationHours: number;
	ladderPlacements: number;
	totalSquares: number;
	anySteep: boolean;
	facetCount: number;
}

/**
 * Hours here are crew hours: the time on site with the whole crew working, because the
 * production rates are a crew's (docs/estimating-model.md §7: a 25-square ranch is 2–3 h for
 * two people, from memory).
 * Technician hours = crew hours × crew size; wages are paid on those.
 * Each line is rounded to the cent once; costCents is their sum.
 */
export function jobLabour(job: JobLabourInput, card: RateCard): LabourResult {
	const { crewSize, centsPerTechnicianHour, setupHours, rinseMinutesPerSquare } = card.labour;
	const perCrewHour = centsPerTechnicianHour * crewSize;
	const lineItems: LabourLineItem[] = [];
	const push = (code: string, label: string, hours: number, detail: string) => {
		lineItems.push({ code, label, detail, hours, amountCents: roundCents(hours * perCrewHour) });
	};
	push(
		'labour.setup',
		'Set-up, pre-wet and teardown',
		setupHours,
		`${shortNumber(setupHours)} h per job`
	);
	if (job.anySteep && card.steepPitch.setupHours > 0) {
		push(
			'labour.steep_setup',
			'Steep-roof anchors and harness set-up',
			card.steepPitch.setupHours,
			`${shortNumber(card.steepPitch.setupHours)} h per job with a facet over ${card.steepPitch.thresholdRise}/12`
		);
	}
	push(
		'labour.application',
		'Application',
		job.applicationHours,
		`${job.facetCount} facet${job.facetCount === 1 ? '' : 's'}: squares × applications ÷ production rate × access, storey and growth factors`
	);
	if (job.ladderPlacements > 0) {
		push(
			'labour.ladder',
			'Ladder set-ups',
			ladderHours(job.ladderPlacements, card.ladder.setupMinutes),
			`${job.ladderPlacements} placement${job.ladderPlacements === 1 ? '' : 's'} × ${card.ladder.setupMinutes} min`
		);
	}
	const rinseHours = (job.totalSquares * rinseMinutesPerSquare) / MIN_PER_HOUR;
	push(
		'labour.rinse',
		'Post-rinse',
		rinseHours,
		`${fixed2(job.totalSquares)} squares × ${shortNumber(rinseMinutesPerSquare)} min`
	);
	let hours = 0;
	let costCents = 0;
	for (const li of lineItems) {
		li.detail += ` = ${fixed2(li.hours)} crew h × ${crewSize} technicians`;
		hours += li.hours;
		costCents += li.amountCents;
	}
	return { hours, technicianHours: hours * crewSize, crewSize, costCents, lineItems };
}
