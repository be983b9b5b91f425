import { doublePrecision, index, jsonb, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from './columns';
import { companies } from './company';

export const customers = pgTable(
	'customers',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		name: text('name').notNull(),
		email: text('email'),
		phone: text('phone'),
		notes: text('notes').notNull().default(''),
		...timestamps
	},
	// The site search matches part of a customer's name (pg_trgm, migration 0014).
	(t) => [index('customers_name_trgm_idx').using('gin', t.name.op('gin_trgm_ops'))]
);

export type SiteFlags = {
	noGutters?: boolean;
	plantsToProtect?: boolean;
	pool?: boolean;
	powerLine?: boolean;
};

export const sites = pgTable(
	'sites',
	{
		id: id(),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		customerId: uuid('customer_id')
			.notNull()
			.references(() => customers.id),
		address: text('address').notNull(),
		lat: doublePrecision('lat').notNull(),
		lon: doublePrecision('lon').notNull(),
		notes: text('notes').notNull().default(''),
		gateCode: text('gate_code'),
		pets: text('pets'),
		waterSource: text('water_source'),
		flags: jsonb('flags').$type<SiteFlags>().notNull().default({}),
		...timestamps
	},
	// The Sites list pages through a company's sites in address order; the search matches part
	// of an address (pg_trgm, migration 0014).
	(t) => [
		index('sites_company_address_idx').on(t.companyId, t.address, t.id),
		index('sites_address_trgm_idx').using('gin', t.address.op('gin_trgm_ops')),
		// A customer's sites: the search by name, and the customer's page.
		index('sites_customer_idx').on(t.customerId)
	]
);
