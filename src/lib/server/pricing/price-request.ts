import { tryEstimate } from '../../estimating';
import type { RateCard } from '../../estimating/rate-card';
import type { EstimateInput, EstimateResult } from '../../estimating/types';
import {
	estimateRequestSchema,
	toEstimateInput,
	type EstimateRequest
} from '../../schemas/estimate';
import { facetIssues, sentFacets, type Facet } from '../../schemas/facet';
import { invalidRefusal, parseJsonBody, type Refusal } from '../api/refusal';

/**
 * The CPU-bound part of POST /api/estimates, from body bytes to answer bytes: decode, parse,
 * validate, price, serialize. No database and no framework, so it runs on a worker thread (pool.ts) or,
 * where there is none, in place — with the same answers either way.
 */

/** A rate-card version as it crosses to a worker: the card as JSON text, which copies cheaply. */
export interface CardRef {
	id: string;
	version: number;
	json: string;
}

export interface PriceTask {
	/** The request body as sent (UTF-8 JSON, not yet checked). */
	body: Uint8Array;
	/** The company's latest card, or null when it has none. */
	card: CardRef | null;
	/**
	 * The roof plan a body names by roofPlanId, its facets as /api/estimates takes them; the main
	 * thread loads it (checked against the caller's company and the body's site) when asked.
	 */
	plan?: PlanRef | null;
}

export interface PlanRef {
	id: string;
	facets: unknown[];
}

export type PriceOutcome =
	| { kind: 'refused'; refusal: Refusal }
	/** The body names another card than the one sent (or there was none): look it up, run again. */
	| { kind: 'needs-card'; rateCardId: string | null }
	/** The body prices a saved roof plan: load it (for this site, if named), run again. */
	| { kind: 'needs-plan'; roofPlanId: string; siteId: string | null }
	/** Priced, not to be saved: the answer, UTF-8 JSON. */
	| { kind: 'priced'; json: Uint8Array }
	/** Priced, to be saved as a draft for the site: what the store needs. */
	| {
			kind: 'save';
			siteId: string;
			roofPlanId: string | null;
			input: EstimateInput;
			result: EstimateResult;
			rateCard: { id: string; version: number };
	  };

// Cards are immutable per id (an edit makes a new version), so a parsed card never goes stale.
const parsedCards = new Map<string, RateCard>();
const MAX_CACHED_CARDS = 64;

function cardOf(ref: CardRef): RateCard {
	let card = parsedCards.get(ref.id);
	if (!card) {
		if (parsedCards.size >= MAX_CACHED_CARDS) parsedCards.clear();
		card = JSON.parse(ref.json) as RateCard;
		parsedCards.set(ref.id, card);
	}
	return card;
}

const encoder = new TextEncoder();

/** Key order and blank labels aside, the same facets in the same order. */
function sameFacets(a: Facet[], b: Facet[]): boolean {
	const canon = (fs: Facet[]) =>
		JSON.stringify(fs.map(({ label, ...f }) => sorted({ ...f, label: label?.trim() || null })));
	return canon(a) === canon(b);
}

function sorted(v: unknown): unknown {
	if (Array.isArray(v)) return v.map(sorted);
	if (v && typeof v === 'object') {
		return Object.fromEntries(
			Object.keys(v)
				.sort()
				.map((k) => [k, sorted((v as Record<string, unknown>)[k])])
		);
	}
	return v;
}

export function priceRequest(task: PriceTask): PriceOutcome {
	const body = parseJsonBody(task.body);
	if (!body.ok) return { kind: 'refused', refusal: body.refusal };
	const parsed = estimateRequestSchema.safeParse(body.value);
	if (!parsed.success) {
		return {
			kind: 'refused',
			refusal: invalidRefusal(facetIssues(parsed.error.issues, sentFacets(body.value)))
		};
	}
	if (parsed.data.save && !parsed.data.siteId) {
		return {
			kind: 'refused',
			refusal: invalidRefusal([{ path: 'siteId', message: 'siteId is required when save is true' }])
		};
	}
	let request: EstimateRequest;
	const roofPlanId = parsed.data.roofPlanId;
	if (roofPlanId === undefined) request = parsed.data;
	else {
		if (task.plan?.id !== roofPlanId) {
			return { kind: 'needs-plan', roofPlanId, siteId: parsed.data.siteId ?? null };
		}
		// The plan's facets go through the same checks as facets sent in the body.
		const { roofPlanId: _r, facets: sent, ...rest } = body.value as Record<string, unknown>;
		const withFacets = estimateRequestSchema.safeParse({ ...rest, facets: task.plan.facets });
		if (!withFacets.success) {
			return {
				kind: 'refused',
				refusal: invalidRefusal(facetIssues(withFacets.error.issues, task.plan.facets), 'roof plan')
			};
		}
		// Facets sent along with a roofPlanId must be that plan's, or it is unclear which was meant.
		if (sent !== undefined && !sameFacets(parsed.data.facets!, withFacets.data.facets!)) {
			return {
				kind: 'refused',
				refusal: invalidRefusal([
					{
						path: 'facets',
						message:
							'facets differ from the saved roof plan roofPlanId names: send roofPlanId alone to price that plan, or facets alone'
					}
				])
			};
		}
		request = { ...withFacets.data, roofPlanId };
	}
	const wanted = request.rateCardId ?? task.card?.id ?? null;
	if (!task.card || wanted !== task.card.id) return { kind: 'needs-card', rateCardId: wanted };

	const input = toEstimateInput(request);
	const outcome = tryEstimate(input, cardOf(task.card));
	if (!outcome.ok) {
		return {
			kind: 'refused',
			refusal: invalidRefusal(facetIssues(outcome.issues, input.facets), 'roof plan')
		};
	}
	const rateCard = { id: task.card.id, version: task.card.version };
	if (request.save) {
		return {
			kind: 'save',
			siteId: request.siteId!,
			roofPlanId: request.roofPlanId ?? null,
			input,
			result: outcome.value,
			rateCard
		};
	}
	return { kind: 'priced', json: encoder.encode(JSON.stringify({ ...outcome.value, rateCard })) };
}
