// mulberry32, a small well-known 32-bit generator: the same
// seed gives the same sequence, which keeps the scene, its tiles and seeded test schedules
// reproducible. Plain JavaScript so the tile generator runs under bare `node`.

/**
 * @param {number} seed
 * @returns {() => number} numbers in [0, 1)
 */
export function mulberry32(seed) {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}
