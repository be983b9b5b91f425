/**
 * Sends site-visit photos one request each, a few at a time, reporting each file's progress.
 * XMLHttpRequest because fetch reports no upload progress.
 */

export type UploadState = 'waiting' | 'sending' | 'done' | 'refused';

export interface UploadItem {
	key: number;
	name: string;
	size: number;
	/** 0…1 of the bytes sent. */
	progress: number;
	state: UploadState;
	message: string;
}

export function sendPhoto(
	url: string,
	file: File,
	onProgress: (fraction: number) => void
): Promise<{ ok: true } | { ok: false; message: string }> {
	return new Promise((resolve) => {
		const xhr = new XMLHttpRequest();
		xhr.open('POST', url);
		xhr.setRequestHeader('x-photo-name', encodeURIComponent(file.name || 'photo'));
		xhr.setRequestHeader('content-type', 'application/octet-stream');
		xhr.setRequestHeader('accept', 'application/json');
		xhr.upload.onprogress = (e) => {
			if (e.lengthComputable && e.total > 0) onProgress(e.loaded / e.total);
		};
		xhr.onload = () => {
			if (xhr.status === 201) return resolve({ ok: true });
			let message = `The upload was refused (${xhr.status}).`;
			try {
				const body = JSON.parse(xhr.responseText) as { message?: unknown };
				if (typeof body.message === 'string') message = body.message;
			} catch {
				/* not JSON: keep the status line */
			}
			resolve({ ok: false, message });
		};
		xhr.onerror = () =>
			resolve({ ok: false, message: `${file.name}: the connection dropped; try again.` });
		xhr.send(file);
	});
}

/** Runs `work` over the items with at most `limit` at once. */
export async function eachLimited<T>(
	items: T[],
	limit: number,
	work: (item: T) => Promise<void>
): Promise<void> {
	let next = 0;
	const lanes = Array.from({ length: Math.min(limit, items.length) }, async () => {
		while (next < items.length) await work(items[next++]);
	});
	await Promise.all(lanes);
}
