import path from 'node:path';

/**
 * The one place that reads the environment. It reads `process.env` rather than `$env/*`
 * so the same code serves the built server, the seed script and the tests.
 */
export const env = {
	get databaseUrl(): string | undefined {
		return process.env.DATABASE_URL || undefined;
	},
	get dataDir(): string {
		return path.resolve(process.env.CLEARPITCH_DATA_DIR || './data/pglite');
	},
	get migrationsDir(): string {
		return path.resolve(process.env.CLEARPITCH_MIGRATIONS_DIR || './drizzle');
	},
	get tilesDir(): string {
		return path.resolve(process.env.CLEARPITCH_TILES_DIR || './geodata/tiles');
	},
	/** Cookies are Secure unless explicitly turned off for plain-HTTP hosts other than localhost. */
	get secureCookies(): boolean {
		return process.env.CLEARPITCH_INSECURE_COOKIES !== '1';
	}
};
