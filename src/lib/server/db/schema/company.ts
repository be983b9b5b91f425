import { jsonb, pgTable, text } from 'drizzle-orm/pg-core';
import { id, timestamps } from './columns';

export const companies = pgTable('companies', {
	id: id(),
	name: text('name').notNull(),
	/** XYZ template of a licensed imagery provider; null means the bundled sample imagery. */
	imageryUrlTemplate: text('imagery_url_template'),
	imageryAttribution: text('imagery_attribution'),
	/** Contact details printed on proposals; null when not given. */
	phone: text('phone'),
	email: text('email'),
	postalAddress: text('postal_address'),
	/** Licence and insurance line, e.g. a state applicator licence number. */
	licence: text('licence'),
	/** Growth-suggestion cuts fitted to site-visit grades; null means the shipped defaults. */
	growthCalibration: jsonb('growth_calibration'),
	...timestamps
});
