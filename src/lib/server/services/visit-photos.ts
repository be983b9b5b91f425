import { and, asc, count, eq } from 'drizzle-orm';
import type { PhotoDto, PhotoRendition } from '../../types/site-visit';
import { getDb } from '../db';
import { photos, siteVisits } from '../db/schema';
import { env } from '../env';
import {
	checkRoomForPhotos,
	deletePhoto,
	photoDto,
	photoFields,
	photoLimits,
	processPhoto,
	storePhoto,
	type StoredPhoto
} from '../photos';
import { getStorage, type StoredFile } from '../storage';
import { Conflict, NotFound } from './errors';
import { getEstimate, type Caller } from './estimates';

/**
 * The photos of a site visit. A photo is checked and re-encoded before anything is stored, its
 * two copies are stored whole or not at all, and its row is written only once both copies are
 * there; any refusal after the copies were stored removes them again.
 */

type PhotoRow = typeof photos.$inferSelect;

async function visitOf(companyId: string, estimateId: string) {
	const db = await getDb();
	const [v] = await db
		.select({ id: siteVisits.id, siteId: siteVisits.siteId })
		.from(siteVisits)
		.where(and(eq(siteVisits.companyId, companyId), eq(siteVisits.estimateId, estimateId)));
	return v;
}

/** The photos of an estimate's visit (none before it starts); NotFound for another's estimate. */
export async function listEstimatePhotos(
	companyId: string,
	estimateId: string
): Promise<PhotoDto[]> {
	const visit = await visitOf(companyId, estimateId);
	if (visit) return listVisitPhotos(companyId, visit.id);
	if (!(await getEstimate(companyId, estimateId))) {
		throw new NotFound(`No estimate with id ${estimateId}.`);
	}
	return [];
}

export async function listVisitPhotos(companyId: string, visitId: string): Promise<PhotoDto[]> {
	const db = await getDb();
	const rows = await db
		.select()
		.from(photos)
		.where(and(eq(photos.companyId, companyId), eq(photos.visitId, visitId)))
		.orderBy(asc(photos.createdAt), asc(photos.id));
	return rows.map(photoDto);
}

async function photoCount(visitId: string): Promise<number> {
	const db = await getDb();
	const [{ n }] = await db.select({ n: count() }).from(photos).where(eq(photos.visitId, visitId));
	return n;
}

/**
 * Adds one uploaded photo to the estimate's visit. Throws PhotoRefusal (naming the file) for a
 * photo it will not take, Conflict before the visit is started.
 */
export async function addVisitPhoto(
	caller: Caller,
	estimateId: string,
	upload: { name: string; bytes: Uint8Array }
): Promise<PhotoDto> {
	const visit = await visitOf(caller.companyId, estimateId);
	if (!visit) {
		if (!(await getEstimate(caller.companyId, estimateId))) {
			throw new NotFound(`No estimate with id ${estimateId}.`);
		}
		throw new Conflict('Start the site visit first, then add its photos.');
	}
	const perVisit = env.photosPerVisit;
	// A cheap first look, so a full visit refuses before the work of decoding.
	checkRoomForPhotos(await photoCount(visit.id), [upload.name], perVisit);
	const processed = await processPhoto(upload, photoLimits());
	const storage = getStorage();
	const stored = await storePhoto(storage, caller.companyId, processed);
	try {
		const db = await getDb();
		const row = await db.transaction(async (tx) => {
			// The visit's row lock queues concurrent uploads, so the count below is exact.
			await tx
				.select({ id: siteVisits.id })
				.from(siteVisits)
				.where(eq(siteVisits.id, visit.id))
				.for('update');
			const [{ n }] = await tx
				.select({ n: count() })
				.from(photos)
				.where(eq(photos.visitId, visit.id));
			checkRoomForPhotos(n, [upload.name], perVisit);
			const [r] = await tx
				.insert(photos)
				.values({
					companyId: caller.companyId,
					siteId: visit.siteId,
					visitId: visit.id,
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

async function photoOfEstimate(
	companyId: string,
	estimateId: string,
	photoId: string
): Promise<PhotoRow> {
	const db = await getDb();
	const [row] = await db
		.select({ p: photos })
		.from(photos)
		.innerJoin(siteVisits, eq(siteVisits.id, photos.visitId))
		.where(
			and(
				eq(photos.id, photoId),
				eq(photos.companyId, companyId),
				eq(siteVisits.estimateId, estimateId)
			)
		);
	if (!row) throw new NotFound('That photo is not one of this site visit’s.');
	return row.p;
}

export async function setPhotoForProposal(
	caller: Caller,
	estimateId: string,
	photoId: string,
	forProposal: boolean
): Promise<PhotoDto> {
	await photoOfEstimate(caller.companyId, estimateId, photoId);
	const db = await getDb();
	const [row] = await db
		.update(photos)
		.set({ forProposal })
		.where(and(eq(photos.id, photoId), eq(photos.companyId, caller.companyId)))
		.returning();
	if (!row) throw new NotFound('That photo is not one of this site visit’s.');
	return photoDto(row);
}

/** Removes the row first: a copy left behind by a failed delete is unreachable, never shown. */
export async function removeVisitPhoto(
	caller: Caller,
	estimateId: string,
	photoId: string
): Promise<void> {
	const p = await photoOfEstimate(caller.companyId, estimateId, photoId);
	const db = await getDb();
	await db.delete(photos).where(and(eq(photos.id, p.id), eq(photos.companyId, caller.companyId)));
	const stored: StoredPhoto = { displayKey: p.displayKey, thumbnailKey: p.thumbnailKey };
	await deletePhoto(getStorage(), stored).catch((e) => {
		console.error(`photo ${p.id}: its files were not removed`, e);
	});
}

/** One rendition of a photo of the company, or null when there is none. */
export async function readPhotoFile(
	companyId: string,
	photoId: string,
	rendition: PhotoRendition
): Promise<StoredFile | null> {
	const db = await getDb();
	const [p] = await db
		.select({ displayKey: photos.displayKey, thumbnailKey: photos.thumbnailKey })
		.from(photos)
		.where(and(eq(photos.id, photoId), eq(photos.companyId, companyId)));
	if (!p) return null;
	return getStorage().get(rendition === 'thumb' ? p.thumbnailKey : p.displayKey);
}
