import { defineConfig } from 'drizzle-kit';

// Migrations are generated from the schema and committed; they are applied at start
// by the app itself, never by drizzle-kit against a live data directory.
export default defineConfig({
	schema: './src/lib/server/db/schema/index.ts',
	out: './drizzle',
	dialect: 'postgresql'
});
