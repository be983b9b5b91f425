import { error } from '@sveltejs/kit';
import { statusOf } from '$lib/server/api/errors';
import { DomainError } from '$lib/server/services/errors';
import { proposalPhoto } from '$lib/server/services/proposals';
import type { RequestHandler } from './$types';

/**
 * A site-visit photo on the customer's proposal (a PUBLIC row: the private link is the key).
 * Only photos the sent version lists are served, as the re-encoded copy without EXIF.
 */
export const GET: RequestHandler = async (event) => {
	let file;
	try {
		file = await proposalPhoto(event.params.token, event.params.id);
	} catch (e) {
		if (e instanceof DomainError) error(statusOf(e), e.message);
		throw e;
	}
	if (!file) error(404, 'No such photo on this proposal.');
	return new Response(file.bytes as Uint8Array<ArrayBuffer>, {
		headers: {
			'content-type': 'image/jpeg',
			'content-length': String(file.size),
			'cache-control': 'private, no-store',
			'referrer-policy': 'no-referrer',
			'x-content-type-options': 'nosniff',
			'x-robots-tag': 'noindex, nofollow'
		}
	});
};
