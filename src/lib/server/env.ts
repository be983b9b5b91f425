import os from 'node:os';
import path from 'node:path';

/** A setting in the environment that Clearpitch cannot run with. */
export class ConfigError extends Error {
	override name = 'ConfigError';
}

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
	/**
	 * Threads that price estimates beside the main thread: by default one per core (piscina's
	 * own default minimum), at most 8; on one core, and when set to 0, pricing runs in place.
	 */
	get pricingThreads(): number {
		const set = process.env.CLEARPITCH_PRICING_THREADS;
		if (set !== undefined && set !== '') {
			const n = Number(set);
			if (!Number.isInteger(n) || n < 0 || n > 64) {
				throw new ConfigError(
					`CLEARPITCH_PRICING_THREADS must be a whole number from 0 to 64 (got "${set}")`
				);
			}
			return n;
		}
		const cores = os.availableParallelism();
		return cores > 1 ? Math.min(8, cores) : 0;
	},
	/** Cookies are Secure unless explicitly turned off for plain-HTTP hosts other than localhost. */
	get secureCookies(): boolean {
		return process.env.CLEARPITCH_INSECURE_COOKIES !== '1';
	}
};
