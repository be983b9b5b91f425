import { boolean, index, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from './columns';
import { companies } from './company';

export const roleEnum = pgEnum('role', ['owner', 'estimator', 'sales', 'crew']);

export const users = pgTable('users', {
	id: id(),
	companyId: uuid('company_id')
		.notNull()
		.references(() => companies.id),
	email: text('email').notNull().unique(),
	name: text('name').notNull(),
	role: roleEnum('role').notNull(),
	passwordHash: text('password_hash').notNull(),
	active: boolean('active').notNull().default(true),
	...timestamps
});

/** Column names `id`, `userId`, `expiresAt` are what the lucia Drizzle adapter reads. */
export const sessions = pgTable(
	'sessions',
	{
		id: text('id').primaryKey(),
		userId: uuid('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		companyId: uuid('company_id')
			.notNull()
			.references(() => companies.id),
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
		...timestamps
	},
	(t) => [index('sessions_user_idx').on(t.userId)]
);

/** Bearer tokens for integrators; only a SHA-256 hash of the secret is stored. */
export const apiTokens = pgTable('api_tokens', {
	id: id(),
	companyId: uuid('company_id')
		.notNull()
		.references(() => companies.id),
	userId: uuid('user_id')
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	name: text('name').notNull(),
	tokenHash: text('token_hash').notNull().unique(),
	lastUsedAt: timestamp('last_used_at', { withTimezone: true, mode: 'date' }),
	revokedAt: timestamp('revoked_at', { withTimezone: true, mode: 'date' }),
	...timestamps
});
