import { PGlite, type PGliteOptions } from '@electric-sql/pglite';
import { pg_trgm } from '@electric-sql/pglite/contrib/pg_trgm';

/**
 * Every PGlite in Clearpitch opens through here, so each carries the extensions the schema uses:
 * `pg_trgm` backs the trigram indexes of the site search, and a database that has them can't
 * write a site or a customer without it. A real PostgreSQL server ships the same extension.
 */
export const PGLITE_EXTENSIONS = { pg_trgm };

/** A data directory, or in memory when `dataDir` is undefined (e.g. to read a dump). */
export function openPglite(dataDir?: string, options: PGliteOptions = {}): PGlite {
	// One options object: PGlite reads its second argument only when the first is a path.
	return new PGlite({
		...options,
		...(dataDir === undefined ? {} : { dataDir }),
		extensions: { ...PGLITE_EXTENSIONS, ...options.extensions }
	});
}
