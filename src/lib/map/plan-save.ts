import { facetBody } from '../schemas/facet';
import {
	planIssues,
	savePlanSchema,
	type PlanFacet,
	type PlanIssue,
	type PlanSource
} from '../schemas/roof-plan';

/** What the editor sends to save a new roof-plan version. */
export function planPayload(p: {
	siteId: string;
	facets: readonly PlanFacet[];
	source: PlanSource;
	note: string;
	baseVersion: number | null;
	basedOnVersion: number | null;
}) {
	return {
		siteId: p.siteId,
		facets: p.facets.map(facetBody),
		source: p.source,
		note: p.note.trim(),
		baseVersion: p.baseVersion,
		basedOnVersion: p.basedOnVersion
	};
}

export type PlanSaveOutcome =
	| { kind: 'saved'; plan: { id: string; version: number; source: PlanSource } }
	| { kind: 'invalid'; issues: { path: string; message: string }[]; message: string }
	/** Someone saved a newer version since this one was opened. */
	| { kind: 'conflict'; message: string; latest: number | null }
	| { kind: 'error'; message: string };

/**
 * Checks the plan with the same schema the server uses (so most mistakes show without a round
 * trip), then posts it. Never throws: every failure is an outcome the editor can show.
 */
export async function savePlanVersion(
	body: ReturnType<typeof planPayload>
): Promise<PlanSaveOutcome> {
	const local = savePlanSchema.safeParse(body);
	if (!local.success) {
		const issues: PlanIssue[] = planIssues(local.error, body);
		const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
		return { kind: 'invalid', issues, message: `Not saved: ${issues[0].message}${more}.` };
	}
	try {
		const r = await fetch('/api/roof-plans', {
			method: 'POST',
			headers: { 'content-type': 'application/json', accept: 'application/json' },
			body: JSON.stringify(body)
		});
		const data = await r.json().catch(() => ({}));
		if (r.status === 201) return { kind: 'saved', plan: data.plan };
		if (r.status === 400) {
			return {
				kind: 'invalid',
				issues: data.issues ?? [],
				message: data.message ?? 'Not saved: the plan has problems.'
			};
		}
		if (r.status === 409) {
			return { kind: 'conflict', message: data.message, latest: data.latestVersion ?? null };
		}
		return {
			kind: 'error',
			message: `${data.message ?? `Not saved (${r.status}).`} Your changes are still here; try again.`
		};
	} catch {
		return {
			kind: 'error',
			message: 'Not saved: the server is unreachable. Your changes are kept on this device.'
		};
	}
}
