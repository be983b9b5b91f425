import fs from 'node:fs/promises';
import path from 'node:path';
import { and, asc, count, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Imagery } from '$lib/map/imagery';
import type { SiteInput } from '$lib/schemas/site';
import { getDb } from '../db';
import { companies, customers, sites, type SiteFlags } from '../db/schema';
import { env } from '../env';

export type SiteSummary = {
	id: string;
	address: string;
	lat: number;
	lon: number;
	customerName: string;
};

/** Search text for ILIKE: % and _ are wildcards to it, and a search for "50%" means the characters. */
const likeText = (q?: string) => {
	const t = q?.trim();
	return t ? `%${t.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : undefined;
};

/**
 * A search reads the trigram indexes of the address and of the customer's name (migration
 * site-search-trigram) and unites the two sets of ids, so it costs the matches, not the sites.
 * An OR across the joined tables would read every site of the company instead.
 */
const searchFilter = (companyId: string, q?: string) => {
	const like = likeText(q);
	return and(
		eq(sites.companyId, companyId),
		like
			? sql`${sites.id} in (
					select id from sites where company_id = ${companyId} and address ilike ${like}
					union
					select s.id from sites s join customers c on c.id = s.customer_id
					 where c.company_id = ${companyId} and c.name ilike ${like})`
			: undefined
	);
};

const summary = {
	id: sites.id,
	address: sites.address,
	lat: sites.lat,
	lon: sites.lon,
	customerName: customers.name
};

export type SitePage = { items: SiteSummary[]; total: number; page: number; pageSize: number };

/**
 * One page of the company's sites in address order, with the number that match. The order reads
 * the (company, address, id) index, so a page costs the same with 10 sites or 10,000.
 */
export async function listSitesPage(
	companyId: string,
	f: { q?: string; page: number; pageSize: number }
): Promise<SitePage> {
	const db = await getDb();
	const filter = searchFilter(companyId, f.q);
	const counted = db.select({ n: count() }).from(sites).where(filter);
	const [[{ n }], items] = await Promise.all([
		counted,
		db
			.select(summary)
			.from(sites)
			.innerJoin(customers, eq(customers.id, sites.customerId))
			.where(filter)
			.orderBy(asc(sites.address), asc(sites.id))
			.limit(f.pageSize)
			.offset((f.page - 1) * f.pageSize)
	]);
	return { items, total: n, page: f.page, pageSize: f.pageSize };
}

export async function getSite(companyId: string, siteId: string) {
	const db = await getDb();
	const [row] = await db
		.select({ site: sites, customer: customers })
		.from(sites)
		.innerJoin(customers, eq(customers.id, sites.customerId))
		.where(and(eq(sites.id, siteId), eq(sites.companyId, companyId)));
	return row;
}

export async function createSite(companyId: string, input: SiteInput) {
	const db = await getDb();
	return db.transaction(async (tx) => {
		const [customer] = await tx
			.insert(customers)
			.values({
				companyId,
				name: input.customerName,
				email: input.customerEmail,
				phone: input.customerPhone
			})
			.returning({ id: customers.id });
		const [site] = await tx
			.insert(sites)
			.values({
				companyId,
				customerId: customer.id,
				address: input.address,
				lat: input.lat,
				lon: input.lon,
				notes: input.notes ?? '',
				gateCode: input.gateCode,
				pets: input.pets,
				waterSource: input.waterSource
			})
			.returning({ id: sites.id });
		return site.id;
	});
}

export interface SiteDetail {
	id: string;
	address: string;
	lat: number;
	lon: number;
	notes: string;
	gateCode: string | null;
	pets: string | null;
	waterSource: string | null;
	flags: SiteFlags;
	customer: { name: string; email: string | null; phone: string | null };
}

/** What a page or the API may show of a site: no internal columns. */
export async function getSiteDetail(companyId: string, siteId: string): Promise<SiteDetail | null> {
	const row = await getSite(companyId, siteId);
	if (!row) return null;
	const { site, customer } = row;
	return {
		id: site.id,
		address: site.address,
		lat: site.lat,
		lon: site.lon,
		notes: site.notes,
		gateCode: site.gateCode,
		pets: site.pets,
		waterSource: site.waterSource,
		flags: site.flags,
		customer: { name: customer.name, email: customer.email, phone: customer.phone }
	};
}

const SAMPLE_ATTRIBUTION = 'Sample imagery of an invented neighbourhood · Clearpitch';

const tileJsonSchema = z.object({
	minzoom: z.number().int().min(0).max(24).optional(),
	maxzoom: z.number().int().min(0).max(24).optional(),
	bounds: z.tuple([z.number(), z.number(), z.number(), z.number()]).optional(),
	attribution: z.string().max(300).optional()
});

/** The sample's TileJSON is written by the tile generator; read it once per process. */
let sampleTileJson: Promise<z.infer<typeof tileJsonSchema>> | undefined;
function readSampleTileJson() {
	sampleTileJson ??= fs
		.readFile(path.join(env.tilesDir, 'tiles.json'), 'utf8')
		.then((t) => tileJsonSchema.parse(JSON.parse(t)))
		.catch(() => {
			sampleTileJson = undefined;
			return {};
		});
	return sampleTileJson;
}

export type { Imagery };

export async function companyImagery(companyId: string): Promise<Imagery> {
	const db = await getDb();
	const [c] = await db
		.select({ template: companies.imageryUrlTemplate, attribution: companies.imageryAttribution })
		.from(companies)
		.where(eq(companies.id, companyId));
	if (c?.template) {
		return {
			sample: false,
			tiles: c.template,
			attribution: c.attribution ?? '',
			minZoom: 0,
			maxZoom: 21,
			bounds: null
		};
	}
	const tj = await readSampleTileJson();
	return {
		sample: true,
		tiles: '/tiles/{z}/{x}/{y}.webp',
		attribution: tj.attribution ?? SAMPLE_ATTRIBUTION,
		minZoom: tj.minzoom ?? 16,
		maxZoom: tj.maxzoom ?? 21,
		bounds: tj.bounds ?? null
	};
}
