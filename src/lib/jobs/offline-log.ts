/**
 * The crew sheet's log on the device (IndexedDB through idb): every tick and note is written
 * here first, marked pending, and sent when there is a connection. Survives reloads and a
 * browser restart; cleared of "pending" only once the server has answered for that version.
 */
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { JobLogState } from '../types/job';

export interface LocalLog {
	jobId: string;
	log: JobLogState;
	/** When this device made the change; the server keeps the newest. */
	clientUpdatedAt: string;
	pending: boolean;
}

interface CrewDb extends DBSchema {
	logs: { key: string; value: LocalLog };
}

let dbp: Promise<IDBPDatabase<CrewDb>> | null = null;

function db(): Promise<IDBPDatabase<CrewDb>> {
	dbp ??= openDB<CrewDb>('clearpitch-crew', 1, {
		upgrade(d) {
			d.createObjectStore('logs', { keyPath: 'jobId' });
		}
	});
	return dbp;
}

export async function readLocal(jobId: string): Promise<LocalLog | undefined> {
	return (await db()).get('logs', jobId);
}

/** Keeps a change on the device as pending; answers the stored entry. */
export async function keepLocal(
	jobId: string,
	log: JobLogState,
	now = new Date()
): Promise<LocalLog> {
	const entry: LocalLog = {
		jobId,
		log: structuredClone(log),
		clientUpdatedAt: now.toISOString(),
		pending: true
	};
	await (await db()).put('logs', entry);
	return entry;
}

/** Marks the entry sent, unless a newer change was kept meanwhile (that one still waits). */
export async function markSent(jobId: string, clientUpdatedAt: string): Promise<void> {
	const d = await db();
	const tx = d.transaction('logs', 'readwrite');
	const cur = await tx.store.get(jobId);
	if (cur && cur.clientUpdatedAt === clientUpdatedAt)
		await tx.store.put({ ...cur, pending: false });
	await tx.done;
}

export type SendResult =
	| { ok: true }
	| { ok: false; offline: true }
	| { ok: false; offline: false; status: number; message: string };

/** One try to send a kept entry. Network failures leave it pending for the next try. */
export async function sendLocal(entry: LocalLog): Promise<SendResult> {
	let res: Response;
	try {
		res = await fetch(`/api/jobs/${entry.jobId}/log`, {
			method: 'PUT',
			headers: { 'content-type': 'application/json', accept: 'application/json' },
			body: JSON.stringify({ ...entry.log, clientUpdatedAt: entry.clientUpdatedAt })
		});
	} catch {
		return { ok: false, offline: true };
	}
	if (res.ok) {
		await markSent(entry.jobId, entry.clientUpdatedAt);
		return { ok: true };
	}
	// The service worker answers 503 for a send it could not make.
	if (res.status === 503) return { ok: false, offline: true };
	const body = (await res.json().catch(() => null)) as { message?: string } | null;
	return {
		ok: false,
		offline: false,
		status: res.status,
		message: body?.message ?? res.statusText
	};
}
