import { and, eq, isNotNull } from 'drizzle-orm';
import {
	calibrate,
	DEFAULT_GROWTH_THRESHOLDS,
	type CalibrationSample,
	type GrowthThresholds
} from '../../estimating/growth-suggest';
import { GROWTH_GRADES, type GrowthGrade } from '../../estimating/types';
import { growthSuggestionSchema } from '../../schemas/facet';
import {
	MIN_CALIBRATION_FACETS,
	storedGrowthCalibrationSchema,
	type GrowthCalibrationView,
	type StoredGrowthCalibration
} from '../../schemas/growth-calibration';
import { getDb, type Db } from '../db';
import { companies, siteVisits } from '../db/schema';
import type { DbTx } from '../mail/outbox';
import { recordAudit } from './audit';
import { Conflict } from './errors';

const parseStored = (v: unknown): StoredGrowthCalibration | null => {
	const p = storedGrowthCalibrationSchema.safeParse(v);
	return p.success ? p.data : null;
};

async function storedOf(db: Db | DbTx, companyId: string, lock = false) {
	const q = db
		.select({ c: companies.growthCalibration })
		.from(companies)
		.where(eq(companies.id, companyId));
	const [row] = lock ? await q.for('update') : await q;
	return parseStored(row?.c);
}

/** The cuts the company's suggestions use: its calibration, else the shipped defaults. */
export async function companyGrowthThresholds(companyId: string): Promise<GrowthThresholds> {
	const s = await storedOf(await getDb(), companyId);
	return s ? { cuts: s.cuts } : DEFAULT_GROWTH_THRESHOLDS;
}

/**
 * The truth to calibrate on: every facet looked at on a confirmed site visit (its grade is what
 * was found on the roof) that still carries the imagery's measures from the office plan.
 */
async function calibrationSamples(db: Db | DbTx, companyId: string): Promise<CalibrationSample[]> {
	const visits = await db
		.select({ facets: siteVisits.facets })
		.from(siteVisits)
		.where(and(eq(siteVisits.companyId, companyId), isNotNull(siteVisits.confirmedAt)));
	const out: CalibrationSample[] = [];
	for (const v of visits) {
		for (const f of Array.isArray(v.facets) ? v.facets : []) {
			if (!f?.checked || !GROWTH_GRADES.includes(f.growth as GrowthGrade)) continue;
			const s = growthSuggestionSchema.safeParse(f.growthSuggestion);
			if (s.success) out.push({ score: s.data.measures.score, grade: f.growth });
		}
	}
	return out;
}

export async function growthCalibrationView(companyId: string): Promise<GrowthCalibrationView> {
	const db = await getDb();
	const [stored, samples] = await Promise.all([
		storedOf(db, companyId),
		calibrationSamples(db, companyId)
	]);
	return {
		stored,
		cuts: stored?.cuts ?? DEFAULT_GROWTH_THRESHOLDS.cuts,
		available: samples.length
	};
}

const cutsText = (c: readonly number[]) => c.map((v) => Number(v.toPrecision(3))).join(' / ');

/**
 * Fits the cuts to the site-visit grades and stores them on the company, with an audit row, in
 * one transaction. Refused (nothing written) with fewer than MIN_CALIBRATION_FACETS facets.
 */
export async function calibrateGrowth(
	companyId: string,
	actorId: string
): Promise<StoredGrowthCalibration> {
	const db = await getDb();
	return db.transaction(async (tx) => {
		const before = await storedOf(tx, companyId, true);
		const samples = await calibrationSamples(tx, companyId);
		if (samples.length < MIN_CALIBRATION_FACETS) {
			throw new Conflict(
				`Calibrating needs at least ${MIN_CALIBRATION_FACETS} facets graded on a confirmed site visit ` +
					`that carry a suggestion from the imagery; there ${samples.length === 1 ? 'is' : 'are'} ` +
					`${samples.length}. Suggest grades in the roof editor, then confirm site visits.`
			);
		}
		const current = before ? { cuts: before.cuts } : DEFAULT_GROWTH_THRESHOLDS;
		const fit = calibrate(samples, current);
		const stored: StoredGrowthCalibration = {
			cuts: fit.thresholds.cuts,
			calibratedAt: new Date().toISOString(),
			samples: fit.samples,
			exactBefore: fit.exactBefore,
			exactAfter: fit.exactAfter,
			errorBefore: fit.errorBefore,
			errorAfter: fit.errorAfter
		};
		await tx
			.update(companies)
			.set({ growthCalibration: stored })
			.where(eq(companies.id, companyId));
		await recordAudit(
			tx,
			companyId,
			{ userId: actorId },
			{
				kind: 'company',
				action: 'growth-calibration',
				subjectId: companyId,
				summary:
					`Calibrated growth suggestions on ${fit.samples} site-visit facets: exact ` +
					`${fit.exactBefore} → ${fit.exactAfter}; cuts ${cutsText(current.cuts)} → ${cutsText(stored.cuts)}`,
				detail: { from: before, to: stored }
			}
		);
		return stored;
	});
}

/** Back to the shipped cuts; refused when they are already in use, so every reset is a change. */
export async function resetGrowthCalibration(companyId: string, actorId: string): Promise<void> {
	const db = await getDb();
	await db.transaction(async (tx) => {
		const [row] = await tx
			.select({ c: companies.growthCalibration })
			.from(companies)
			.where(eq(companies.id, companyId))
			.for('update');
		if (row?.c == null) throw new Conflict('Growth suggestions already use the default cuts.');
		await tx.update(companies).set({ growthCalibration: null }).where(eq(companies.id, companyId));
		await recordAudit(
			tx,
			companyId,
			{ userId: actorId },
			{
				kind: 'company',
				action: 'growth-calibration-reset',
				subjectId: companyId,
				summary: `Reset growth suggestions to the default cuts ${cutsText(DEFAULT_GROWTH_THRESHOLDS.cuts)}`,
				detail: { from: parseStored(row.c), to: null }
			}
		);
	});
}
