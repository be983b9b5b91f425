import { and, desc, eq, inArray, max } from 'drizzle-orm';
import type { Polygon } from 'geojson';
import { measurePlan } from '$lib/map/plan-measure';
import { facetSchema } from '$lib/schemas/facet';
import type { PlanFacet, PlanSource, SavePlanInput } from '$lib/schemas/roof-plan';
import type { RoofPlanDto, VersionSummary } from '../../types/roof-plan';
import { getDb } from '../db';
import { roofPlans, sites, users } from '../db/schema';

/**
 * Roof plans are versioned and never edited in place: each save is a new version, and a site
 * visit saves a copy of the latest. Facets are stored as a GeoJSON FeatureCollection, one
 * Feature per facet with its properties.
 */

export interface StoredFacetCollection {
	type: 'FeatureCollection';
	/** The version this one was copied from (a site-visit copy or a restored older version). */
	basedOnVersion?: number | null;
	features: Array<{
		type: 'Feature';
		id: string;
		geometry: Polygon;
		properties: Omit<PlanFacet, 'id' | 'geometry'>;
	}>;
}

export function toCollection(
	facets: PlanFacet[],
	basedOnVersion: number | null
): StoredFacetCollection {
	return {
		type: 'FeatureCollection',
		basedOnVersion,
		features: facets.map(({ id, geometry, ...properties }) => ({
			type: 'Feature',
			id,
			geometry,
			properties
		}))
	};
}

/**
 * Reads a stored collection back. Rows were validated on the way in; one that no longer passes
 * (written by an older build, say) loses only its bad facets, never the whole plan view.
 */
export function fromCollection(value: unknown): PlanFacet[] {
	const features =
		value && typeof value === 'object' && Array.isArray((value as StoredFacetCollection).features)
			? (value as StoredFacetCollection).features
			: [];
	const out: PlanFacet[] = [];
	for (const f of features) {
		const parsed = facetSchema.safeParse({
			...(f?.properties ?? {}),
			id: String(f?.id ?? ''),
			geometry: f?.geometry
		});
		if (parsed.success) out.push(parsed.data);
	}
	return out;
}

const source = (s: string): PlanSource => (s === 'site_visit' ? 'site_visit' : 'remote');

type Row = typeof roofPlans.$inferSelect & { createdByName: string | null };

function toDto(row: Row): RoofPlanDto {
	const facets = fromCollection(row.facets);
	const m = measurePlan(facets);
	const based = (row.facets as StoredFacetCollection | null)?.basedOnVersion;
	return {
		id: row.id,
		siteId: row.siteId,
		version: row.version,
		source: source(row.source),
		note: row.note,
		createdAt: row.createdAt.toISOString(),
		createdBy: row.createdByName,
		basedOnVersion: typeof based === 'number' ? based : null,
		facets,
		measures: m.facets,
		totals: m.totals
	};
}

const planColumns = {
	id: roofPlans.id,
	companyId: roofPlans.companyId,
	siteId: roofPlans.siteId,
	version: roofPlans.version,
	source: roofPlans.source,
	facets: roofPlans.facets,
	note: roofPlans.note,
	createdBy: roofPlans.createdBy,
	createdAt: roofPlans.createdAt,
	updatedAt: roofPlans.updatedAt,
	createdByName: users.name
};

export async function siteExists(companyId: string, siteId: string): Promise<boolean> {
	const db = await getDb();
	const [s] = await db
		.select({ id: sites.id })
		.from(sites)
		.where(and(eq(sites.id, siteId), eq(sites.companyId, companyId)));
	return !!s;
}

export async function listVersions(companyId: string, siteId: string): Promise<VersionSummary[]> {
	const db = await getDb();
	const rows = await db
		.select(planColumns)
		.from(roofPlans)
		.leftJoin(users, eq(users.id, roofPlans.createdBy))
		.where(and(eq(roofPlans.companyId, companyId), eq(roofPlans.siteId, siteId)))
		.orderBy(desc(roofPlans.version));
	return rows.map((r) => {
		const d = toDto(r);
		return {
			id: d.id,
			version: d.version,
			source: d.source,
			note: d.note,
			createdAt: d.createdAt,
			createdBy: d.createdBy,
			facetCount: d.facets.length,
			slopedAreaFt2: d.totals.slopedAreaFt2,
			squares: d.totals.squares
		};
	});
}

/** One version of a site's plan, or its latest when `version` is omitted; null if none. */
export async function getPlan(
	companyId: string,
	siteId: string,
	version?: number
): Promise<RoofPlanDto | null> {
	const db = await getDb();
	const [row] = await db
		.select(planColumns)
		.from(roofPlans)
		.leftJoin(users, eq(users.id, roofPlans.createdBy))
		.where(
			and(
				eq(roofPlans.companyId, companyId),
				eq(roofPlans.siteId, siteId),
				version === undefined ? undefined : eq(roofPlans.version, version)
			)
		)
		.orderBy(desc(roofPlans.version))
		.limit(1);
	return row ? toDto(row) : null;
}

export async function getPlanById(companyId: string, planId: string): Promise<RoofPlanDto | null> {
	const db = await getDb();
	const [row] = await db
		.select(planColumns)
		.from(roofPlans)
		.leftJoin(users, eq(users.id, roofPlans.createdBy))
		.where(and(eq(roofPlans.companyId, companyId), eq(roofPlans.id, planId)));
	return row ? toDto(row) : null;
}

export type SaveOutcome =
	| { ok: true; plan: RoofPlanDto }
	| { ok: false; reason: 'no_site' }
	| { ok: false; reason: 'bad_based_on'; latestVersion: number | null }
	| { ok: false; reason: 'stale'; latestVersion: number | null };

const isUniqueViolation = (e: unknown) =>
	!!e &&
	typeof e === 'object' &&
	((e as { code?: string }).code === '23505' ||
		(e as { cause?: { code?: string } }).cause?.code === '23505');

/**
 * Saves the plan as the site's next version. With `baseVersion` the save is refused (stale)
 * when someone else saved a newer version since the editor opened, so no edit is silently
 * buried under another.
 */
export async function savePlan(
	companyId: string,
	userId: string | null,
	input: SavePlanInput
): Promise<SaveOutcome> {
	const db = await getDb();
	for (let attempt = 0; ; attempt++) {
		try {
			const outcome = await db.transaction(async (tx): Promise<SaveOutcome> => {
				const [site] = await tx
					.select({ id: sites.id })
					.from(sites)
					.where(and(eq(sites.id, input.siteId), eq(sites.companyId, companyId)));
				if (!site) return { ok: false, reason: 'no_site' };
				const [{ latest }] = await tx
					.select({ latest: max(roofPlans.version) })
					.from(roofPlans)
					.where(eq(roofPlans.siteId, input.siteId));
				const current = latest ?? null;
				if (input.baseVersion !== undefined && input.baseVersion !== current) {
					return { ok: false, reason: 'stale', latestVersion: current };
				}
				if (input.basedOnVersion != null && (current === null || input.basedOnVersion > current)) {
					return { ok: false, reason: 'bad_based_on', latestVersion: current };
				}
				const [row] = await tx
					.insert(roofPlans)
					.values({
						companyId,
						siteId: input.siteId,
						version: (current ?? 0) + 1,
						source: input.source,
						facets: toCollection(input.facets, input.basedOnVersion ?? null),
						note: input.note,
						createdBy: userId
					})
					.returning({ id: roofPlans.id });
				return { ok: true, plan: { id: row.id } as RoofPlanDto };
			});
			if (!outcome.ok) return outcome;
			const plan = await getPlanById(companyId, outcome.plan.id);
			return { ok: true, plan: plan! };
		} catch (e) {
			if (!isUniqueViolation(e)) throw e;
			// Two saves raced for one version number. An editor that said which version it
			// started from has now been overtaken; a plain save just takes the next number.
			if (input.baseVersion !== undefined) {
				const latest = await getPlan(companyId, input.siteId);
				return { ok: false, reason: 'stale', latestVersion: latest?.version ?? null };
			}
			if (attempt >= 3) throw e;
		}
	}
}

export interface LatestPlanSummary {
	version: number;
	source: PlanSource;
	facetCount: number;
	squares: number;
}

/** The latest version of each listed site's plan in one query, for a page of the Sites list. */
export async function latestPlanSummaries(
	companyId: string,
	siteIds: string[]
): Promise<Map<string, LatestPlanSummary>> {
	if (siteIds.length === 0) return new Map();
	const db = await getDb();
	const rows = await db
		.selectDistinctOn([roofPlans.siteId], {
			siteId: roofPlans.siteId,
			version: roofPlans.version,
			source: roofPlans.source,
			facets: roofPlans.facets
		})
		.from(roofPlans)
		.where(and(eq(roofPlans.companyId, companyId), inArray(roofPlans.siteId, siteIds)))
		.orderBy(roofPlans.siteId, desc(roofPlans.version));
	const out = new Map<string, LatestPlanSummary>();
	for (const r of rows) {
		const facets = fromCollection(r.facets);
		out.set(r.siteId, {
			version: r.version,
			source: source(r.source),
			facetCount: facets.length,
			squares: measurePlan(facets).totals.squares
		});
	}
	return out;
}
