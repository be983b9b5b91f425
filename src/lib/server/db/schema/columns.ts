import { timestamp, uuid } from 'drizzle-orm/pg-core';

/** Every table carries these, so a second tenant is a migration, not a rewrite. */
export const timestamps = {
	createdAt: timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
	updatedAt: timestamp('updated_at', { withTimezone: true, mode: 'date' })
		.notNull()
		.defaultNow()
		.$onUpdate(() => new Date())
};

export const id = () => uuid('id').primaryKey().defaultRandom();
