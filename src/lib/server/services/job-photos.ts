import { and, asc, count, eq } from 'drizzle-orm';
import type { PhotoDto } from '../../types/site-visit';
import { getDb } from '../db';
import { estimates, jobs, photos } from '../db/schema';
import { env } from '../env';
import {
	checkRoomForPhotos,
	deletePhoto,
	photoDto,
	photoFields,
	photoLimits,
	processPhoto,
	storePhoto
} from '../photos';
import { getStorage } from '../storage';
import { Conflict, NotFound } from './errors';

/**
 * The crew's after photos of a job: the same checks, re-encoding and storage as site-visit
 * photos (`../photos`), kept in the same table with the job instead of the visit. Who may reach
 * a job is the crew sheet's rule; callers check it (getSheet) before calling these.
 */

export async function countAfterPhotos(companyId: string, jobId: string): Promise<number> {
	const db = await getDb();
	const [{ n }] = await db
		.select({ n: count() })
		.from(photos)
		.where(and(eq(photos.companyId, companyId), eq(photos.jobId, jobId)));
	return n;
}

export async function listAfterPhotos(companyId: string, jobId: string): Promise<PhotoDto[]> {
	const db = await getDb();
	const rows = await db
		.select()
		.from(photos)
		.where(and(eq(photos.companyId, companyId), eq(photos.jobId, jobId)))
		.orderBy(asc(photos.createdAt), asc(photos.id));
	return rows.map(photoDto);
}

/**
 * Adds one after photo to a job (not yet paid). Throws PhotoRefusal (naming the file) for a
 * photo it will not take; the stored copies are removed again if the row cannot be written.
 */
export async function addAfterPhoto(
	caller: { id: string; companyId: string },
	jobId: string,
	upload: { name: string; bytes: Uint8Array }
): Promise<PhotoDto> {
	const db = await getDb();
	const [job] = await db
		.select({ id: jobs.id, status: jobs.status })
		.from(jobs)
		.where(and(eq(jobs.id, jobId), eq(jobs.companyId, caller.companyId)));
	if (!job) throw new NotFound(`No job with id ${jobId}.`);
	if (job.status === 'paid') throw new Conflict('This job is paid and closed; add no more photos.');
	const cap = env.photosPerVisit;
	checkRoomForPhotos(await countAfterPhotos(caller.companyId, jobId), [upload.name], cap);
	const processed = await processPhoto(upload, photoLimits());
	const storage = getStorage();
	const stored = await storePhoto(storage, caller.companyId, processed);
	try {
		const row = await db.transaction(async (tx) => {
			// The job's row lock queues concurrent uploads, so the count below is exact.
			await tx.select({ id: jobs.id }).from(jobs).where(eq(jobs.id, jobId)).for('update');
			const [{ n }] = await tx.select({ n: count() }).from(photos).where(eq(photos.jobId, jobId));
			checkRoomForPhotos(n, [upload.name], cap);
			const [site] = await tx
				.select({ id: estimates.siteId })
				.from(jobs)
				.innerJoin(estimates, eq(estimates.id, jobs.estimateId))
				.where(eq(jobs.id, jobId));
			if (!site?.id) throw new Conflict('This job’s estimate has no site to keep photos under.');
			const [r] = await tx
				.insert(photos)
				.values({
					companyId: caller.companyId,
					siteId: site.id,
					jobId,
					...photoFields(processed, stored),
					createdBy: caller.id
				})
				.returning();
			return r;
		});
		return photoDto(row);
	} catch (e) {
		await deletePhoto(storage, stored).catch(() => {});
		throw e;
	}
}
