// Seeds the invented demo company. Idempotent: a second run changes nothing.
import { closeDb } from '../src/lib/server/db';
import { seedDemo } from '../src/lib/server/seed/demo';

const report = await seedDemo();
console.log(
	`Demo seeded: ${report.created.users} users, ${report.created.sites} sites, ` +
		`${report.created.rateCards} rate cards created (existing rows left as they were).`
);
await closeDb();
