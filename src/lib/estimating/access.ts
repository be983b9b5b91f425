import type { AccessGrade, Material } from './types';

/**
 * Common practice (docs/estimating-model.md §5, §14): clay and concrete tile and slate break
 * underfoot and are not walked; work them from a ladder at the eave, a roof ladder or a lift.
 * A safety rule, not a rate, so it is not on the rate card.
 */
export const NOT_WALKABLE: ReadonlySet<Material> = new Set(['clay_tile', 'concrete_tile', 'slate']);

const MATERIAL_NAMES: Record<Material, string> = {
	asphalt_shingle: 'asphalt shingle',
	clay_tile: 'clay tile',
	concrete_tile: 'concrete tile',
	metal: 'metal',
	slate: 'slate',
	wood_shake: 'wood shake'
};
export const materialName = (m: Material): string => MATERIAL_NAMES[m] ?? m;

/** "Steep roof" means a slope over 4 in 12 for fall protection (29 CFR 1926.500(b)). */
export const OSHA_STEEP_ROOF_RISE = 4;

/** Why an access grade is refused for a material, or null when it is allowed. */
export function accessRefusal(material: Material, access: AccessGrade): string | null {
	if (access === 'roof' && NOT_WALKABLE.has(material)) {
		return `roof access is refused on ${materialName(material)}: it is fragile and not walked; use ladder or lift access`;
	}
	return null;
}

/** One ladder placement per so many feet of eave, at least one, on ladder facets only. */
export function ladderPlacements(
	access: AccessGrade,
	eaveLengthFt: number,
	eaveFtPerPlacement: number
): number {
	if (access !== 'ladder') return 0;
	// The small slack keeps 50.000000001 ft of eave at 2 placements, not 3.
	return Math.max(1, Math.ceil(eaveLengthFt / eaveFtPerPlacement - 1e-9));
}
