// Seeds the invented demo company. Idempotent: a second run changes nothing.
import { closeDb } from '../src/lib/server/db';
import { seedDemo } from '../src/lib/server/seed/demo';

const report = await seedDemo({ samples: process.env.CLEARPITCH_SEED_SAMPLES !== '0' });
console.log(
	`Demo seeded: ${report.created.users} users, ${report.created.sites} sites, ` +
		`${report.created.rateCards} rate cards, ${report.created.roofPlans} roof plans, ` +
		`${report.created.estimates} estimates created (existing rows left as they were).`
);
await closeDb();
