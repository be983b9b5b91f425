// Prints the row count of one table (used by tests and for quick checks).
import { sql } from 'drizzle-orm';
import { closeDb, getDb } from '../src/lib/server/db';

const table = process.argv[2];
if (!table || !/^[a-z_]+$/.test(table)) throw new Error('usage: count-rows.ts TABLE');
const db = await getDb();
const res = await db.execute(sql.raw(`select count(*)::int as n from "${table}"`));
console.log(String((res.rows[0] as { n: number }).n));
await closeDb();
