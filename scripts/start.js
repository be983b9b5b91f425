// Starts the built server. PORT defaults to 3000; ORIGIN to http://localhost:PORT, because
// adapter-node otherwise assumes https and refuses form posts made over plain HTTP.
process.env.PORT ??= '3000';
process.env.ORIGIN ??= `http://localhost:${process.env.PORT}`;
console.log(`Clearpitch is starting at ${process.env.ORIGIN}`);
await import('../build/index.js');
