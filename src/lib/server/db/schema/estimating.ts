import {
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	text,
	unique,
	uuid,
	boolean
} from 'drizzle-orm/pg-core';
import { ESTIMATE_STATUSES } from '../../../estimate-status';
import { id, timestamps } from './columns';
import { companies } from './company';
import { users } from './auth';
import { sites } from './sites';

/** A rate card is never edited in place: each save is a new version, older ones stay. */
export const rateCards = pgTable(
	'rate_cards',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		version: integer('version').notNull(),
		card: jsonb('card').notNull(),
		isDefault: boolean('is_default').notNull().default(false),
		note: text('note').notNull().default(''),
		createdBy: uuid('created_by').references(() => users.id),
		...timestamps
	},
	(t) => [unique('rate_cards_company_version').on(t.companyId, t.version)]
);

export const estimateStatusEnum = pgEnum('estimate_status', ESTIMATE_STATUSES);

export const estimates = pgTable(
	'estimates',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		siteId: uuid('site_id').references(() => sites.id),
		/** The roof-plan version it was priced from, if any: the company's, of the same site. */
		roofPlanId: uuid('roof_plan_id').references(() => roofPlans.id),
		status: estimateStatusEnum('status').notNull().default('draft'),
		rateCardId: uuid('rate_card_id')
			.notNull()
			.references(() => rateCards.id),
		rateCardVersion: integer('rate_card_version').notNull(),
		/** The full request it was priced with, frozen. */
		input: jsonb('input').notNull(),
		/** The full model output, frozen: later rate changes never touch it. */
		result: jsonb('result').notNull(),
		totalCents: integer('total_cents').notNull(),
		createdBy: uuid('created_by').references(() => users.id),
		...timestamps
	},
	// The estimates list pages newest first (created_at desc, id desc: these indexes read
	// backwards), for the company or for one site.
	(t) => [
		index('estimates_company_created_idx').on(t.companyId, t.createdAt, t.id),
		index('estimates_site_created_idx').on(t.siteId, t.createdAt, t.id)
	]
);

/** A roof plan is versioned: a later site visit edits a copy. */
export const roofPlans = pgTable(
	'roof_plans',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		siteId: uuid('site_id')
			.notNull()
			.references(() => sites.id),
		version: integer('version').notNull(),
		source: text('source').notNull().default('remote'),
		/** GeoJSON FeatureCollection of facets with their properties. */
		facets: jsonb('facets').notNull(),
		note: text('note').notNull().default(''),
		createdBy: uuid('created_by').references(() => users.id),
		...timestamps
	},
	(t) => [unique('roof_plans_site_version').on(t.siteId, t.version)]
);
