/**
 * Pitch as the US trade gives it: rise in inches per 12 in of run (docs/estimating-model.md §2).
 */

/** Slope (pitch) multiplier √(1+(rise/12)²) = 1/cos θ: sloped area = plan area × this. */
export function pitchMultiplier(rise: number): number {
	const t = rise / 12;
	return Math.sqrt(1 + t * t);
}

/** Hip/valley length per unit of common-rafter run (equal pitches both sides): √(2+(rise/12)²). */
export function hipValleyFactor(rise: number): number {
	const t = rise / 12;
	return Math.sqrt(2 + t * t);
}

/** Framing-square rafter table: rafter length in inches per foot of run, 12·m. */
export function rafterInchesPerFootRun(rise: number): number {
	return 12 * pitchMultiplier(rise);
}

/** Roof angle in degrees. */
export function pitchAngleDeg(rise: number): number {
	return (Math.atan(rise / 12) * 180) / Math.PI;
}
