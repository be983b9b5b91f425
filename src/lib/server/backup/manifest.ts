import { z } from 'zod';

/** What the first line of every check reads: an archive of another kind is refused outright. */
export const BACKUP_FORMAT = 'clearpitch-backup';
/** Bumped when the archive's layout changes; restore refuses a version it does not know. */
export const BACKUP_VERSION = 1;

export const MANIFEST_NAME = 'manifest.json';
/** PGlite's own dump of its data directory (a gzipped tar, as `dumpDataDir` writes it). */
export const PGLITE_DUMP = 'database/pglite.tar.gz';
/** `pg_dump`'s plain SQL, with DROP … IF EXISTS before every object. */
export const POSTGRES_DUMP = 'database/postgres.sql';
export const FILES_DIR = 'files';

const sha256 = z.string().regex(/^[0-9a-f]{64}$/, 'a SHA-256 in hex');
// The storage module's own key rule (storage/keys.ts): segments of letters, digits, '-' and '_'.
const storageKey = z
	.string()
	.regex(/^[A-Za-z0-9_-]{1,100}(\/[A-Za-z0-9_-]{1,100}){0,7}$/, 'a storage key');

const entry = z.object({ size: z.number().int().nonnegative(), sha256 });

export const manifestSchema = z.strictObject({
	format: z.literal(BACKUP_FORMAT),
	version: z.literal(BACKUP_VERSION),
	createdAt: z.iso.datetime(),
	database: entry.extend({
		kind: z.enum(['pglite', 'postgres']),
		path: z.enum([PGLITE_DUMP, POSTGRES_DUMP])
	}),
	/** Rows per table (schema-qualified name) in the dump itself, checked again on restore. */
	tables: z.record(z.string().regex(/^[a-z_]+\.[a-z_]+$/), z.number().int().nonnegative()),
	/** `disk`: the uploaded files are in the archive; `s3`: they stay in the bucket. */
	filesStore: z.enum(['disk', 's3']),
	files: z.array(entry.extend({ key: storageKey, contentType: z.string().min(1).max(200) }))
});

export type Manifest = z.infer<typeof manifestSchema>;
export type FileEntry = Manifest['files'][number];
