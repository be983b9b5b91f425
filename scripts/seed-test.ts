// Migrates and seeds the demo into CLEARPITCH_DATA_DIR (used by the tests), then exits.
import { closeDb } from '../src/lib/server/db';
import { seedDemo } from '../src/lib/server/seed/demo';

await seedDemo();
await closeDb();
