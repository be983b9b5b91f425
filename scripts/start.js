// Starts the built server. PORT defaults to 3000; ORIGIN to http://localhost:PORT, because
// adapter-node otherwise assumes https and refuses form posts made over plain HTTP.
process.env.PORT ??= '3000';
process.env.ORIGIN ??= `http://localhost:${process.env.PORT}`;
// adapter-node refuses a body over BODY_SIZE_LIMIT (512 KB by default) before any route reads
// it. A photo upload is one photo per request, sent as the body itself, so the limit is the
// photo cap (CLEARPITCH_PHOTO_MAX_MB, 15 by default) plus 1 MB; the upload route refuses a photo
// over the cap itself, naming the file. JSON endpoints keep their own smaller cap (api/body.ts).
const photoMb = Number(process.env.CLEARPITCH_PHOTO_MAX_MB || 15);
if (Number.isFinite(photoMb) && photoMb > 0) {
	process.env.BODY_SIZE_LIMIT ??= String(Math.ceil(photoMb * 1024 * 1024) + 1024 * 1024);
}
console.log(`Clearpitch is starting at ${process.env.ORIGIN}`);
await import('../build/index.js');
