/**
 * The pricing worker's entry: piscina runs this module's default export on its threads. It is
 * imported dynamically, so the build gives it a chunk of its own, whose address is workerUrl.
 */
export { priceRequest as default } from './price-request';

export const workerUrl = import.meta.url;
