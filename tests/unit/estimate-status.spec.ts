// The estimate status table: every legal move and who may make it, and the moves that are not
// on the path. The table is Clearpitch's own workflow (common practice for a quote's life:
// drafted, sent, answered, worked, paid); there is no outside source for it, so the expected
// answers are written out here by hand, one row per move, rather than derived from the table.
import { describe, expect, it } from 'vitest';
import {
	ESTIMATE_STATUSES,
	JOB_MOVES,
	legalNext,
	nextStatusesFor,
	rolesForMove,
	type EstimateStatus
} from '../../src/lib/estimate-status';
import type { Role } from '../../src/lib/roles';

const ROLES: Role[] = ['owner', 'estimator', 'sales', 'crew'];

/** from → to → the roles that may make the move. */
const EXPECTED: [EstimateStatus, EstimateStatus, Role[]][] = [
	['draft', 'ready', ['owner', 'estimator']],
	['ready', 'sent', ['owner', 'sales']],
	['ready', 'draft', ['owner', 'estimator']],
	['ready', 'expired', ['owner', 'sales']],
	['sent', 'accepted', ['owner', 'sales']],
	['sent', 'declined', ['owner', 'sales']],
	['sent', 'expired', ['owner', 'sales']],
	['accepted', 'scheduled', ['owner', 'sales']],
	['scheduled', 'done', ['owner', 'crew']],
	['done', 'paid', ['owner']]
];

describe('estimate status moves', () => {
	it.each(EXPECTED)('%s → %s is legal for %j only', (from, to, roles) => {
		expect(rolesForMove(from, to)).toEqual(roles);
		for (const role of ROLES) {
			expect(nextStatusesFor(from, role).includes(to)).toBe(roles.includes(role));
		}
	});

	it('allows no other move between any two statuses', () => {
		const legal = new Set(EXPECTED.map(([f, t]) => `${f}>${t}`));
		for (const from of ESTIMATE_STATUSES) {
			for (const to of ESTIMATE_STATUSES) {
				if (legal.has(`${from}>${to}`)) continue;
				expect(rolesForMove(from, to), `${from} → ${to}`).toBeUndefined();
			}
		}
	});

	it('lists the legal next statuses whoever asks', () => {
		expect(legalNext('draft')).toEqual(['ready']);
		expect(legalNext('ready').sort()).toEqual(['draft', 'expired', 'sent']);
		expect(legalNext('sent').sort()).toEqual(['accepted', 'declined', 'expired']);
		for (const end of ['paid', 'declined', 'expired'] as const) expect(legalNext(end)).toEqual([]);
	});

	it('gives crew only the close of a scheduled job, and the owner every legal one', () => {
		for (const from of ESTIMATE_STATUSES) {
			expect(nextStatusesFor(from, 'crew')).toEqual(from === 'scheduled' ? ['done'] : []);
			expect(nextStatusesFor(from, 'owner').sort()).toEqual(legalNext(from).sort());
		}
	});
});

describe('moves that carry data of their own', () => {
	it('sends scheduling, done and paid to the screens that collect their data', () => {
		expect(Object.keys(JOB_MOVES).sort()).toEqual(['done', 'paid', 'scheduled']);
	});
});
