// Applies the committed migrations in drizzle/ to the configured database and exits.
import { closeDb, databaseKind } from '../src/lib/server/db';
import { env } from '../src/lib/server/env';

const kind = await databaseKind();
console.log(
	`Migrations applied (${kind === 'pglite' ? `PGlite at ${env.dataDir}` : 'PostgreSQL'}).`
);
await closeDb();
