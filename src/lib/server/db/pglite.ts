import { PGlite, type PGliteOptions } from '@electric-sql/pglite';
import { pg_trgm } from '@electric-sql/pglite/contrib/pg_trgm';

/**
 * Every PGlite in Clearpitch opens through here, so each carries the extensions the schema uses:
 * `pg_trgm` backs the trigram indexes of the site search, and a database that has them can't
 * write a site or a customer without it. A real PostgreSQL server ships the same extension.
 */
export const PGLITE_EXTENSIONS = { pg_trgm };

export function openPglite(dataDir?: string, options: PGliteOptions = {}): PGlite {
	return new PGlite(dataDir, {
		...options,
		extensions: { ...PGLITE_EXTENSIONS, ...options.extensions }
	});
}
