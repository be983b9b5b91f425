import { sql } from 'drizzle-orm';
import {
	boolean,
	check,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgTable,
	text,
	timestamp,
	unique,
	uuid
} from 'drizzle-orm/pg-core';
import type { VisitFacet } from '../../../types/site-visit';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { sites } from './sites';
import { estimates, roofPlans } from './estimating';
import { jobs } from './jobs';

/**
 * What the salesperson found on site for one estimate: the facets as confirmed or corrected,
 * what the crew will face around the house, and the test spot. The corrections stay here until
 * the visit is confirmed; confirming saves them as the site's next roof-plan version (source
 * "site_visit") and re-prices the estimate.
 */
export const siteVisits = pgTable(
	'site_visits',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		estimateId: uuid('estimate_id')
			.notNull()
			.references(() => estimates.id),
		siteId: uuid('site_id')
			.notNull()
			.references(() => sites.id),
		/** The remote plan version the visit started from (null: the estimate's own facets). */
		basePlanId: uuid('base_plan_id').references(() => roofPlans.id),
		/** The facets as the visit has them: the base plan's, with the on-site corrections. */
		facets: jsonb('facets').$type<VisitFacet[]>().notNull(),
		/** Obstacle codes from OBSTACLES in $lib/types/site-visit. */
		obstacles: jsonb('obstacles').$type<string[]>().notNull().default([]),
		waterSource: text('water_source').notNull().default(''),
		pets: text('pets').notNull().default(''),
		gateNotes: text('gate_notes').notNull().default(''),
		notes: text('notes').notNull().default(''),
		testStrengthPct: doublePrecision('test_strength_pct'),
		testSeconds: integer('test_seconds'),
		testRinsedClean: boolean('test_rinsed_clean'),
		/** Facets the test spot stands for; empty means all of them. */
		testFacetIds: jsonb('test_facet_ids').$type<string[]>().notNull().default([]),
		/** The site-visit copy of the roof plan saved on confirming. */
		confirmedPlanId: uuid('confirmed_plan_id').references(() => roofPlans.id),
		confirmedAt: timestamp('confirmed_at', { withTimezone: true, mode: 'date' }),
		confirmedBy: uuid('confirmed_by').references(() => users.id),
		startedBy: uuid('started_by').references(() => users.id),
		/** Counts the visit's changes: a write names the revision it read, so none is lost. */
		revision: integer('revision').notNull().default(0),
		...timestamps
	},
	(t) => [
		unique('site_visits_estimate_uq').on(t.estimateId),
		index('site_visits_site_idx').on(t.siteId)
	]
);

/**
 * A site-visit photo. Only the re-encoded copies are stored (no EXIF: sharp writes none); the
 * position and time read from the original's EXIF are kept here, the original itself never.
 */
export const photos = pgTable(
	'photos',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		siteId: uuid('site_id')
			.notNull()
			.references(() => sites.id),
		/** A site-visit photo has its visit; a crew's after photo has its job (exactly one of them). */
		visitId: uuid('visit_id').references(() => siteVisits.id),
		jobId: uuid('job_id').references(() => jobs.id),
		displayKey: text('display_key').notNull(),
		thumbnailKey: text('thumbnail_key').notNull(),
		/** The uploader's file name, for captions only; never part of a storage key. */
		fileName: text('file_name').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		lat: doublePrecision('lat'),
		lon: doublePrecision('lon'),
		/** The camera's wall-clock time as it wrote it, "YYYY-MM-DDTHH:MM:SS". */
		takenAt: text('taken_at'),
		takenAtOffset: text('taken_at_offset'),
		/** Marked by the salesperson to appear on the customer's proposal. */
		forProposal: boolean('for_proposal').notNull().default(false),
		createdBy: uuid('created_by').references(() => users.id),
		...timestamps
	},
	(t) => [
		index('photos_visit_idx').on(t.visitId, t.createdAt),
		index('photos_job_idx').on(t.jobId, t.createdAt),
		check('photos_one_owner', sql`num_nonnulls(${t.visitId}, ${t.jobId}) = 1`)
	]
);
