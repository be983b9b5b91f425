// Tests open a stopped server's data directory the way the server does: with the extensions
// the schema's indexes need (see src/lib/server/db/pglite.ts).
export { openPglite } from '../../src/lib/server/db/pglite';
