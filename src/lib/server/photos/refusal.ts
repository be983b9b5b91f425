export type PhotoRefusalReason =
	| 'empty'
	| 'too-large'
	| 'not-an-image'
	| 'type-not-allowed'
	| 'too-many-pixels'
	| 'unreadable'
	| 'too-many-photos';

/**
 * A photo Clearpitch will not take, naming the file and why. Routes answer it with a 4xx
 * (413 for too-large, 415 for the type refusals, 422 for the rest, 409 for too-many-photos).
 */
export class PhotoRefusal extends Error {
	override name = 'PhotoRefusal';
	constructor(
		readonly file: string,
		readonly reason: PhotoRefusalReason,
		detail: string
	) {
		super(`${displayName(file)}: ${detail}`);
	}
}

/** The user's file name as shown back in a message: trimmed, control characters removed. */
function displayName(name: string): string {
	// Unicode's Cc category: the C0 controls, DEL and the C1 controls.
	const clean = String(name ?? '')
		.replace(/\p{Cc}/gu, '')
		.trim();
	return (clean || 'unnamed file').slice(0, 120);
}
