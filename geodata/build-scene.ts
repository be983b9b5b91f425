/**
 * Builds geodata/scene.geojson, the invented Wrenfield neighbourhood that Clearpitch's sample
 * imagery is drawn from and that measurement tests compare against.
 *
 *   npx tsx geodata/build-scene.ts
 *
 * Every roof is laid out in metres in a plane around its house centre and only then turned into
 * longitude/latitude, so ridges, hips and valleys of neighbouring facets are the very same
 * numbers. The plane is the ellipsoidal local plane x = N·cosφ0·Δλ, y = M·Δφ (WGS84), which keeps
 * plan areas within a fraction of a ppm of the geodesic area at house scale. The stored truth is
 * nevertheless computed with GeographicLib from the final coordinates, so it is the truth of the
 * file, not of the layout.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import geographiclib from 'geographiclib-geodesic';
import { mulberry32 } from './prng.js';

export type Edge = 'eave' | 'rake' | 'ridge' | 'hip' | 'valley';
export type Material =
	'asphalt_shingle' | 'clay_tile' | 'concrete_tile' | 'metal' | 'slate' | 'wood_shake';
export type Growth = 'G0' | 'G1' | 'G2' | 'G3' | 'G4';
export type Access = 'ground' | 'ladder' | 'roof' | 'lift';
export type Section = 'main' | 'wing' | 'garage' | 'porch' | 'dormer';

type Pt = [number, number];

/** Open ring in house-local metres: u along the house, v across it, before the house's turn. */
interface FacetDef {
	/** `{dir}` / `{Dir}` become the compass direction the facet drains towards. */
	name: string;
	section: Section;
	pts: Pt[];
	edges: Edge[];
	pitch: number;
	material: Material;
	growth: Growth;
	access: Access;
	stories: number;
	eaveHeightM: number;
	shade: string;
	notes?: string;
}

interface HouseDef {
	id: string;
	number: number;
	street: string;
	customer: string;
	/** House centre in scene metres (east, north of the scene origin). */
	centre: Pt;
	/** Turn of the house's u axis, degrees counter-clockwise from east. */
	rot: number;
	noGutters: boolean;
	roofType: string;
	notes: string;
	facets: FacetDef[];
}

const ORIGIN = { lat: 35.52, lon: -74.46 };
const WGS84_A = 6378137;
const WGS84_F = 1 / 298.257223563;
const FT2_PER_M2 = 1 / (0.3048 * 0.3048);
const FT_PER_M = 1 / 0.3048;
const TOWN = 'Wrenfield';
const geod = geographiclib.Geodesic.WGS84;

// ---------------------------------------------------------------------------------------------
// Local plane

function radii(latDeg: number) {
	const e2 = WGS84_F * (2 - WGS84_F);
	const s = Math.sin((latDeg * Math.PI) / 180);
	const w = 1 - e2 * s * s;
	return { M: (WGS84_A * (1 - e2)) / (w * Math.sqrt(w)), N: WGS84_A / Math.sqrt(w) };
}

function plane(lat0: number, lon0: number) {
	const { M, N } = radii(lat0);
	const kx = (N * Math.cos((lat0 * Math.PI) / 180) * Math.PI) / 180;
	const ky = (M * Math.PI) / 180;
	return {
		toLonLat: ([x, y]: Pt): Pt => [lon0 + x / kx, lat0 + y / ky],
		fromLonLat: ([lon, lat]: Pt): Pt => [(lon - lon0) * kx, (lat - lat0) * ky]
	};
}

const scenePlane = plane(ORIGIN.lat, ORIGIN.lon);

/** 1e-9° is about 0.1 mm: far below any measuring error, and it keeps the file readable. */
const round9 = (v: number) => Math.round(v * 1e9) / 1e9;
const roundLL = ([lon, lat]: Pt): Pt => [round9(lon), round9(lat)];
const sceneLL = (p: Pt): Pt => roundLL(scenePlane.toLonLat(p));

// ---------------------------------------------------------------------------------------------
// Roof builders (house-local metres)

type Common = Omit<FacetDef, 'name' | 'pts' | 'edges' | 'section'> & { section?: Section };

function gableAlongU(a: number, b: number, south: Common, north: Common, off: Pt = [0, 0]) {
	const o = (u: number, v: number): Pt => [u + off[0], v + off[1]];
	const sec = south.section ?? 'main';
	return [
		{
			...south,
			section: sec,
			name: sec === 'main' ? '{Dir} slope' : `${cap(sec)} {dir} slope`,
			pts: [o(-a, -b), o(a, -b), o(a, 0), o(-a, 0)],
			edges: ['eave', 'rake', 'ridge', 'rake']
		},
		{
			...north,
			section: sec,
			name: sec === 'main' ? '{Dir} slope' : `${cap(sec)} {dir} slope`,
			pts: [o(-a, 0), o(a, 0), o(a, b), o(-a, b)],
			edges: ['ridge', 'rake', 'eave', 'rake']
		}
	] satisfies FacetDef[];
}

function gableAlongV(a: number, b: number, west: Common, east: Common, off: Pt = [0, 0]) {
	const o = (u: number, v: number): Pt => [u + off[0], v + off[1]];
	const sec = west.section ?? 'main';
	const nm = sec === 'main' ? '{Dir} slope' : `${cap(sec)} {dir} slope`;
	return [
		{
			...west,
			section: sec,
			name: nm,
			pts: [o(-a, -b), o(0, -b), o(0, b), o(-a, b)],
			edges: ['rake', 'ridge', 'rake', 'eave']
		},
		{
			...east,
			section: sec,
			name: nm,
			pts: [o(0, -b), o(a, -b), o(a, b), o(0, b)],
			edges: ['rake', 'eave', 'rake', 'ridge']
		}
	] satisfies FacetDef[];
}

/** Hip roof on a w × d outline (w ≥ d), equal pitch all round; w = d gives a pyramid. */
function hip(w: number, d: number, s: Common, e: Common, n: Common, wst: Common): FacetDef[] {
	const a = w / 2;
	const b = d / 2;
	const r = a - b;
	if (r < 0) throw new Error('hip(): width must not be less than depth');
	const pyramid = r === 0;
	return [
		pyramid
			? {
					...s,
					section: 'main',
					name: '{Dir} slope',
					pts: [
						[-a, -b],
						[a, -b],
						[0, 0]
					],
					edges: ['eave', 'hip', 'hip']
				}
			: {
					...s,
					section: 'main',
					name: '{Dir} slope',
					pts: [
						[-a, -b],
						[a, -b],
						[r, 0],
						[-r, 0]
					],
					edges: ['eave', 'hip', 'ridge', 'hip']
				},
		{
			...e,
			section: 'main',
			name: pyramid ? '{Dir} slope' : '{Dir} hip end',
			pts: [
				[a, -b],
				[a, b],
				[r, 0]
			],
			edges: ['eave', 'hip', 'hip']
		},
		pyramid
			? {
					...n,
					section: 'main',
					name: '{Dir} slope',
					pts: [
						[a, b],
						[-a, b],
						[0, 0]
					],
					edges: ['eave', 'hip', 'hip']
				}
			: {
					...n,
					section: 'main',
					name: '{Dir} slope',
					pts: [
						[-r, 0],
						[r, 0],
						[a, b],
						[-a, b]
					],
					edges: ['ridge', 'hip', 'eave', 'hip']
				},
		{
			...wst,
			section: 'main',
			name: pyramid ? '{Dir} slope' : '{Dir} hip end',
			pts: [
				[-a, b],
				[-a, -b],
				[-r, 0]
			],
			edges: ['eave', 'hip', 'hip']
		}
	];
}

function cap(s: string) {
	return s.charAt(0).toUpperCase() + s.slice(1);
}

// ---------------------------------------------------------------------------------------------
// The ten houses

function base(
	material: Material,
	pitch: number,
	stories: number,
	eaveHeightM: number,
	shade: string,
	growth: Growth,
	access: Access = 'ground',
	notes?: string
): Common {
	return {
		material,
		pitch,
		stories,
		eaveHeightM,
		shade,
		growth,
		access,
		...(notes ? { notes } : {})
	};
}

/** Weathered-wood laminated shingle shared by h01 and h02, so the two differ only in growth. */
const WEATHERED_WOOD = '#6b5e52';

function h03Facets(): FacetDef[] {
	// Main gable along u; a wing of the same pitch runs north from the east end. With equal
	// pitches the wing's lower ridge dies into the main north slope 3 m (its half-width) in from
	// the eave, and the valleys run at 45° in plan from the inside corners to that point.
	const m = (g: Growth, acc: Access = 'ground', notes?: string) =>
		base('asphalt_shingle', 8, 2, 5.8, '#4a4a4c', g, acc, notes);
	return [
		{
			...m('G1'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-8, -4],
				[8, -4],
				[8, 0],
				[-8, 0]
			],
			edges: ['eave', 'rake', 'ridge', 'rake']
		},
		{
			...m('G3'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-8, 0],
				[8, 0],
				[8, 4],
				[5, 1],
				[2, 4],
				[-8, 4]
			],
			edges: ['ridge', 'rake', 'valley', 'valley', 'eave', 'rake']
		},
		{
			...m('G2'),
			section: 'wing',
			name: 'Wing {dir} slope',
			pts: [
				[2, 4],
				[5, 1],
				[5, 10],
				[2, 10]
			],
			edges: ['valley', 'ridge', 'rake', 'eave']
		},
		{
			...m(
				'G3',
				'ladder',
				'Fence 1.4 m off the wall with shrubs between: ladder only, no room to spray from the ground.'
			),
			section: 'wing',
			name: 'Wing {dir} slope',
			pts: [
				[5, 1],
				[8, 4],
				[8, 10],
				[5, 10]
			],
			edges: ['valley', 'eave', 'rake', 'ridge']
		}
	];
}

function h04Facets(): FacetDef[] {
	// Clay tile hip (14 × 10) with a later single-car garage on the east: a hip-ended wing 5 m
	// wide whose ridge, at half the main's, runs into the main east hip end; both meet in valleys.
	const OLD = '#a9593a';
	const NEW = '#c98552';
	const m = (g: Growth) => base('clay_tile', 5, 1, 3.0, OLD, g);
	const gar = (g: Growth) => ({
		...base(
			'clay_tile',
			5,
			1,
			3.0,
			NEW,
			g,
			'ground',
			'Garage added later; its tiles are from another batch and read lighter.'
		),
		section: 'garage' as const
	});
	return [
		{
			...m('G1'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-7, -5],
				[7, -5],
				[2, 0],
				[-2, 0]
			],
			edges: ['eave', 'hip', 'ridge', 'hip']
		},
		{
			...m('G3'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-2, 0],
				[2, 0],
				[7, 5],
				[-7, 5]
			],
			edges: ['ridge', 'hip', 'eave', 'hip']
		},
		{
			...m('G2'),
			section: 'main',
			name: '{Dir} hip end',
			pts: [
				[-7, 5],
				[-7, -5],
				[-2, 0]
			],
			edges: ['eave', 'hip', 'hip']
		},
		{
			...m('G2'),
			section: 'main',
			name: '{Dir} hip end',
			pts: [
				[7, -5],
				[7, -3],
				[4.5, -0.5],
				[7, 2],
				[7, 5],
				[2, 0]
			],
			edges: ['eave', 'valley', 'valley', 'eave', 'hip', 'hip']
		},
		{
			...gar('G1'),
			name: 'Garage {dir} slope',
			pts: [
				[7, -3],
				[13, -3],
				[10.5, -0.5],
				[4.5, -0.5]
			],
			edges: ['eave', 'hip', 'ridge', 'valley']
		},
		{
			...gar('G1'),
			name: 'Garage {dir} slope',
			pts: [
				[4.5, -0.5],
				[10.5, -0.5],
				[13, 2],
				[7, 2]
			],
			edges: ['ridge', 'hip', 'eave', 'valley']
		},
		{
			...gar('G0'),
			name: 'Garage {dir} hip end',
			pts: [
				[13, -3],
				[13, 2],
				[10.5, -0.5]
			],
			edges: ['eave', 'hip', 'hip']
		}
	];
}

function h06Facets(): FacetDef[] {
	// Two-storey hip with a 2/12 shed porch roof across part of the front (−v). The porch's high
	// edge meets the wall under the main eave, so the main front eave carries the porch corners as
	// vertices and the two plans share that stretch without a T-junction.
	const m = (g: Growth) => base('asphalt_shingle', 7, 2, 5.8, '#7a7266', g);
	return [
		{
			...m('G1'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-6.5, -5],
				[-4, -5],
				[3, -5],
				[6.5, -5],
				[1.5, 0],
				[-1.5, 0]
			],
			edges: ['eave', 'eave', 'eave', 'hip', 'ridge', 'hip']
		},
		{
			...m('G2'),
			section: 'main',
			name: '{Dir} hip end',
			pts: [
				[6.5, -5],
				[6.5, 5],
				[1.5, 0]
			],
			edges: ['eave', 'hip', 'hip']
		},
		{
			...m('G3'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-1.5, 0],
				[1.5, 0],
				[6.5, 5],
				[-6.5, 5]
			],
			edges: ['ridge', 'hip', 'eave', 'hip']
		},
		{
			...m('G2'),
			section: 'main',
			name: '{Dir} hip end',
			pts: [
				[-6.5, 5],
				[-6.5, -5],
				[-1.5, 0]
			],
			edges: ['eave', 'hip', 'hip']
		},
		{
			...base(
				'metal',
				2,
				1,
				2.7,
				'#9aa0a3',
				'G1',
				'ground',
				'Low-slope porch roof; its high edge meets the front wall under the main eave.'
			),
			section: 'porch',
			name: 'Porch roof',
			pts: [
				[-4, -7.6],
				[3, -7.6],
				[3, -5],
				[-4, -5]
			],
			edges: ['eave', 'rake', 'ridge', 'rake']
		}
	];
}

function h07Facets(): FacetDef[] {
	// Steep slate gable with two gable dormers on the front (−v) slope. Each dormer's face rises
	// from the wall line and interrupts the main eave; its own eaves sit RAISE above the main
	// eave, so the main slope meets each dormer cheek along a short up-slope edge (labelled rake,
	// the name of the edge it runs like) and the dormer roof in two valleys.
	const a = 7.5;
	const b = 5;
	const r = 12 / 12;
	const half = 1.4;
	const RAISE = 1.0;
	const dr = 12 / 12;
	const v1 = -b + RAISE / r;
	const v2 = -b + (RAISE + half * dr) / r;
	const centres = [-3.5, 3.5];
	const eaveH = 3.6;
	const slate = (g: Growth, eh = eaveH) => base('slate', 12, 2, eh, '#4b5059', g, 'lift');

	const pts: Pt[] = [[-a, -b]];
	const edges: Edge[] = [];
	for (const c of centres) {
		edges.push('eave', 'rake', 'valley', 'valley', 'rake');
		pts.push([c - half, -b], [c - half, v1], [c, v2], [c + half, v1], [c + half, -b]);
	}
	edges.push('eave', 'rake', 'ridge', 'rake');
	pts.push([a, -b], [a, 0], [-a, 0]);

	const facets: FacetDef[] = [
		{ ...slate('G3'), section: 'main', name: '{Dir} slope', pts, edges },
		{
			...slate('G2'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-a, 0],
				[a, 0],
				[a, b],
				[-a, b]
			],
			edges: ['ridge', 'rake', 'eave', 'rake']
		}
	];
	centres.forEach((c, i) => {
		const d = { ...slate('G2', eaveH + RAISE), section: 'dormer' as const };
		facets.push(
			{
				...d,
				name: `Dormer ${i + 1} {dir} side`,
				pts: [
					[c - half, -b],
					[c, -b],
					[c, v2],
					[c - half, v1]
				],
				edges: ['rake', 'ridge', 'valley', 'eave']
			},
			{
				...d,
				name: `Dormer ${i + 1} {dir} side`,
				pts: [
					[c, -b],
					[c + half, -b],
					[c + half, v1],
					[c, v2]
				],
				edges: ['rake', 'eave', 'valley', 'ridge']
			}
		);
	});
	return facets;
}

function h08Facets(): FacetDef[] {
	// Asymmetric gable: a short steep front slope and a long shallow rear one, eaves level, so the
	// ridge sits where 3.5 m at 8/12 and 5.6 m at 5/12 reach the same height (2.333 m).
	const front = 3.5;
	const rear = (front * 8) / 5;
	const b0 = -(front + rear) / 2;
	const ridgeV = b0 + front;
	const shake = (p: number, g: Growth, notes?: string) =>
		base('wood_shake', p, 2, 5.6, '#8a7560', g, 'ladder', notes);
	return [
		{
			...shake(8, 'G2'),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-6, b0],
				[6, b0],
				[6, ridgeV],
				[-6, ridgeV]
			],
			edges: ['eave', 'rake', 'ridge', 'rake']
		},
		{
			...shake(
				5,
				'G4',
				'Under the cedar: thick moss on the lower courses, needles in the keyways.'
			),
			section: 'main',
			name: '{Dir} slope',
			pts: [
				[-6, ridgeV],
				[6, ridgeV],
				[6, b0 + front + rear],
				[-6, b0 + front + rear]
			],
			edges: ['ridge', 'rake', 'eave', 'rake']
		}
	];
}

function h10Facets(): FacetDef[] {
	const m = (g: Growth) => base('asphalt_shingle', 4, 1, 3.0, '#5c6266', g, 'roof');
	const garage = gableAlongV(
		3.5,
		3.6,
		{ ...base('asphalt_shingle', 4, 1, 2.8, '#5c6266', 'G2', 'roof'), section: 'garage' },
		{ ...base('asphalt_shingle', 4, 1, 2.8, '#5c6266', 'G2', 'roof'), section: 'garage' },
		[-13, -0.4]
	).map((f) => ({ ...f, name: 'Detached garage {dir} slope' }));
	return [...hip(15, 10, m('G1'), m('G1'), m('G2'), m('G1')), ...garage];
}

const HOUSES: HouseDef[] = [
	{
		id: 'h01',
		number: 14,
		street: 'Tidewater Lane',
		customer: 'Marisol Quenby',
		centre: [-118, -24],
		rot: 0,
		noGutters: false,
		roofType: 'Gable',
		notes: 'Oak over the north slope fills the front gutter each autumn. Spigot by the driveway.',
		facets: gableAlongU(
			7,
			4.8,
			base('asphalt_shingle', 6, 1, 3.0, WEATHERED_WOOD, 'G2'),
			base(
				'asphalt_shingle',
				6,
				1,
				3.0,
				WEATHERED_WOOD,
				'G4',
				'ground',
				'Moss along the lower courses under the oak.'
			)
		)
	},
	{
		id: 'h02',
		number: 18,
		street: 'Tidewater Lane',
		customer: 'Dorian Halloway',
		centre: [-82, -24],
		rot: 0,
		noGutters: false,
		roofType: 'Gable',
		notes: 'Re-roofed two years ago; owner wants a preventive treatment only.',
		facets: gableAlongU(
			6.6,
			4.6,
			base('asphalt_shingle', 6, 1, 3.0, WEATHERED_WOOD, 'G0'),
			base('asphalt_shingle', 6, 1, 3.0, WEATHERED_WOOD, 'G0')
		)
	},
	{
		id: 'h03',
		number: 22,
		street: 'Tidewater Lane',
		customer: 'Priya Vantongeren',
		centre: [-44, -27],
		rot: 0,
		noGutters: false,
		roofType: 'L-shaped cross-gable',
		notes: 'Side fence and hydrangeas tight along the east wall. Gate code 4417.',
		facets: h03Facets()
	},
	{
		id: 'h04',
		number: 9,
		street: 'Alder Loop',
		customer: 'Teodor Marsh-Ellery',
		centre: [30, 45],
		rot: 0,
		noGutters: false,
		roofType: 'Hip with hip-ended garage addition',
		notes: 'Pool in the back yard behind a fence: cover it and keep runoff out. Fragile tile.',
		facets: h04Facets()
	},
	{
		id: 'h05',
		number: 15,
		street: 'Alder Loop',
		customer: 'Hollis Brandtvik',
		centre: [105, 152],
		rot: 0,
		noGutters: true,
		roofType: 'Gable, standing seam',
		notes:
			'No gutters: runoff falls straight onto the beds along both eaves; soak the plants first.',
		facets: gableAlongU(
			7.2,
			4.2,
			base('metal', 4, 1, 3.2, '#4f6660', 'G1'),
			base('metal', 4, 1, 3.2, '#4f6660', 'G1')
		)
	},
	{
		id: 'h06',
		number: 16,
		street: 'Alder Loop',
		customer: 'Ines Calloway-Rudd',
		centre: [88, 62],
		rot: -90,
		noGutters: false,
		roofType: 'Hip with low-slope porch',
		notes: 'Porch roof is metal at 2/12 over the front door. Two cats indoors on job day.',
		facets: h06Facets()
	},
	{
		id: 'h07',
		number: 20,
		street: 'Alder Loop',
		customer: 'Barnaby Osterfeld',
		centre: [126, 62],
		rot: 90,
		noGutters: false,
		roofType: 'Steep gable with two gable dormers',
		notes: 'Slate: nobody walks it. Lift from the driveway; copper valleys.',
		facets: h07Facets()
	},
	{
		id: 'h08',
		number: 3,
		street: 'Saltmarsh Court',
		customer: 'Lucinda Pardoe',
		centre: [-28, -82],
		rot: 90,
		noGutters: false,
		roofType: 'Asymmetric gable',
		notes: 'Cedar shake: low-strength mix only. Big cedar behind the house shades the rear slope.',
		facets: h08Facets()
	},
	{
		id: 'h09',
		number: 5,
		street: 'Saltmarsh Court',
		customer: 'Ezekiel Tamsworth',
		centre: [10, -112],
		rot: 0,
		noGutters: false,
		roofType: 'Pyramid hip',
		notes: 'Concrete tile, two storeys. Koi pond by the front step: cover it.',
		facets: hip(
			11,
			11,
			base('concrete_tile', 5, 2, 5.9, '#8c7a6e', 'G1'),
			base('concrete_tile', 5, 2, 5.9, '#8c7a6e', 'G2'),
			base('concrete_tile', 5, 2, 5.9, '#8c7a6e', 'G3'),
			base('concrete_tile', 5, 2, 5.9, '#8c7a6e', 'G1')
		)
	},
	{
		id: 'h10',
		number: 7,
		street: 'Saltmarsh Court',
		customer: 'Rosalind Okonkwo-Hale',
		centre: [46, -80],
		rot: -90,
		noGutters: false,
		roofType: 'Hip with detached gable garage',
		notes: 'Low pitch, walkable. Detached garage priced with the house.',
		facets: h10Facets()
	}
];

// ---------------------------------------------------------------------------------------------
// Geometry checks and truth

const COMPASS = [
	'north',
	'north-east',
	'east',
	'south-east',
	'south',
	'south-west',
	'west',
	'north-west'
];

function shoelace(p: Pt[]) {
	let s = 0;
	for (let i = 0; i < p.length; i++) {
		const [x1, y1] = p[i];
		const [x2, y2] = p[(i + 1) % p.length];
		s += x1 * y2 - x2 * y1;
	}
	return s / 2;
}

interface Placed {
	def: FacetDef;
	xy: Pt[];
	down: Pt;
	heights: number[];
	azimuth: number;
	label: string;
}

/** Downslope unit vector: the outward normal of the eave edges (right-hand side of a CCW ring). */
function downslope(xy: Pt[], edges: Edge[], where: string): Pt {
	let nx = 0;
	let ny = 0;
	let first: Pt | null = null;
	for (let i = 0; i < xy.length; i++) {
		if (edges[i] !== 'eave') continue;
		const [x1, y1] = xy[i];
		const [x2, y2] = xy[(i + 1) % xy.length];
		const len = Math.hypot(x2 - x1, y2 - y1);
		const n: Pt = [(y2 - y1) / len, -(x2 - x1) / len];
		if (first && first[0] * n[0] + first[1] * n[1] < 1 - 1e-9)
			throw new Error(`${where}: eave edges are not parallel`);
		first ??= n;
		nx += n[0] * len;
		ny += n[1] * len;
	}
	if (!first) throw new Error(`${where}: a facet needs at least one eave`);
	const l = Math.hypot(nx, ny);
	return [nx / l, ny / l];
}

function place(h: HouseDef): Placed[] {
	const t = (h.rot * Math.PI) / 180;
	const c = Math.cos(t);
	const s = Math.sin(t);
	const placed = h.facets.map((def, k): Placed => {
		const where = `${h.id} facet ${k + 1}`;
		if (def.pts.length !== def.edges.length) throw new Error(`${where}: one edge per segment`);
		const xy = def.pts.map(([u, v]): Pt => [u * c - v * s, u * s + v * c]);
		if (shoelace(xy) <= 0) throw new Error(`${where}: ring must run counter-clockwise`);
		const down = downslope(xy, def.edges, where);
		const eaveI = def.edges.indexOf('eave');
		const e0 = xy[eaveI];
		const rise = def.pitch / 12;
		const heights = xy.map(
			([x, y]) => def.eaveHeightM + ((e0[0] - x) * down[0] + (e0[1] - y) * down[1]) * rise
		);
		def.edges.forEach((e, i) => {
			const j = (i + 1) % xy.length;
			const level = Math.abs(heights[i] - heights[j]) < 1e-9;
			if ((e === 'eave' || e === 'ridge') && !level)
				throw new Error(`${where}: ${e} ${i} not level`);
			if (e === 'eave' && Math.abs(heights[i] - def.eaveHeightM) > 1e-9)
				throw new Error(`${where}: eave ${i} off the eave line`);
		});
		const azimuth = ((Math.atan2(down[0], down[1]) * 180) / Math.PI + 360) % 360;
		const dir = COMPASS[Math.round(azimuth / 45) % 8];
		const label = def.name.replace('{dir}', dir).replace('{Dir}', cap(dir));
		return { def, xy, down, heights, azimuth, label };
	});
	checkJoins(h.id, placed);
	const labels = new Set(placed.map((p) => p.label));
	if (labels.size !== placed.length) throw new Error(`${h.id}: facet labels must be unique`);
	return placed;
}

const key = ([x, y]: Pt) => `${Math.round(x * 1000)},${Math.round(y * 1000)}`;

/**
 * Facets of one house must meet as a real roof does: a shared segment is the same ridge, hip or
 * valley on both sides at the same heights, or one of the two step joints where a lower roof
 * meets a wall (porch high edge under an eave, dormer eave over the main slope's cheek edge).
 * No vertex may sit on another facet's edge without being one of its vertices.
 */
function checkJoins(id: string, placed: Placed[]) {
	const segs = new Map<string, { f: number; i: number; e: Edge }[]>();
	placed.forEach((p, f) =>
		p.xy.forEach((a, i) => {
			const b = p.xy[(i + 1) % p.xy.length];
			const k = [key(a), key(b)].sort().join('|');
			const list = segs.get(k) ?? [];
			list.push({ f, i, e: p.def.edges[i] });
			segs.set(k, list);
		})
	);
	for (const [k, list] of segs) {
		if (list.length === 1) continue;
		if (list.length > 2) throw new Error(`${id}: segment ${k} used by ${list.length} facets`);
		const [p, q] = list;
		const P = placed[p.f];
		const Q = placed[q.f];
		const pair = [p.e, q.e].sort().join('+');
		if (p.e === q.e && (p.e === 'ridge' || p.e === 'hip' || p.e === 'valley')) {
			const hp = [P.heights[p.i], P.heights[(p.i + 1) % P.xy.length]];
			const hq = [Q.heights[(q.i + 1) % Q.xy.length], Q.heights[q.i]];
			if (Math.abs(hp[0] - hq[0]) > 1e-6 || Math.abs(hp[1] - hq[1]) > 1e-6)
				throw new Error(`${id}: ${p.e} ${k} meets at different heights`);
			continue;
		}
		const sections = [P.def.section, Q.def.section];
		const step =
			(pair === 'eave+ridge' && sections.includes('porch')) ||
			(pair === 'eave+rake' && sections.includes('dormer'));
		if (!step) throw new Error(`${id}: segment ${k} joins ${pair}`);
	}
	placed.forEach((A, fa) =>
		placed.forEach((B, fb) => {
			if (fa === fb) return;
			for (const v of A.xy) {
				for (let i = 0; i < B.xy.length; i++) {
					const a = B.xy[i];
					const b = B.xy[(i + 1) % B.xy.length];
					const dx = b[0] - a[0];
					const dy = b[1] - a[1];
					const t = ((v[0] - a[0]) * dx + (v[1] - a[1]) * dy) / (dx * dx + dy * dy);
					if (t <= 1e-6 || t >= 1 - 1e-6) continue;
					const d = Math.hypot(a[0] + t * dx - v[0], a[1] + t * dy - v[1]);
					if (d < 1e-3) throw new Error(`${id}: vertex ${key(v)} sits inside an edge`);
				}
			}
		})
	);
}

function geodesicArea(ring: Pt[]) {
	const poly = geod.Polygon(false);
	for (const [lon, lat] of ring.slice(0, -1)) poly.AddPoint(lat, lon);
	const area = poly.Compute(false, true).area;
	if (area === undefined || area <= 0) throw new Error('ring must enclose a positive area');
	return area;
}

function geodesicLength(a: Pt, b: Pt) {
	const s12 = geod.Inverse(a[1], a[0], b[1], b[0]).s12;
	if (s12 === undefined) throw new Error('no distance');
	return s12;
}

const r6 = (v: number) => Math.round(v * 1e6) / 1e6;
const r3 = (v: number) => Math.round(v * 1e3) / 1e3;

// ---------------------------------------------------------------------------------------------
// Context: streets, parcels, driveways, trees, fences, shrubs, pool

type Feature = {
	type: 'Feature';
	properties: Record<string, unknown>;
	geometry:
		| { type: 'Point'; coordinates: Pt }
		| { type: 'LineString'; coordinates: Pt[] }
		| { type: 'Polygon'; coordinates: Pt[][] };
};

const point = (properties: Record<string, unknown>, p: Pt): Feature => ({
	type: 'Feature',
	properties,
	geometry: { type: 'Point', coordinates: sceneLL(p) }
});
const line = (properties: Record<string, unknown>, pts: Pt[]): Feature => ({
	type: 'Feature',
	properties,
	geometry: { type: 'LineString', coordinates: pts.map(sceneLL) }
});
/** Scene-metre ring, turned counter-clockwise and closed. */
const polygon = (properties: Record<string, unknown>, pts: Pt[]): Feature => {
	const ring = shoelace(pts) < 0 ? [...pts].reverse() : pts;
	const ll = ring.map(sceneLL);
	return {
		type: 'Feature',
		properties,
		geometry: { type: 'Polygon', coordinates: [[...ll, ll[0]]] }
	};
};
const rect = (x0: number, y0: number, x1: number, y1: number): Pt[] => [
	[x0, y0],
	[x1, y0],
	[x1, y1],
	[x0, y1]
];
function arc(cx: number, cy: number, r: number, a0: number, a1: number, steps: number): Pt[] {
	const out: Pt[] = [];
	for (let i = 0; i <= steps; i++) {
		const a = ((a0 + ((a1 - a0) * i) / steps) * Math.PI) / 180;
		out.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
	}
	return out;
}
function roundedRect(x0: number, y0: number, x1: number, y1: number, r: number): Pt[] {
	return [
		...arc(x1 - r, y0 + r, r, -90, 0, 6),
		...arc(x1 - r, y1 - r, r, 0, 90, 6),
		...arc(x0 + r, y1 - r, r, 90, 180, 6),
		...arc(x0 + r, y0 + r, r, 180, 270, 6)
	];
}

function distToSeg(p: Pt, a: Pt, b: Pt) {
	const dx = b[0] - a[0];
	const dy = b[1] - a[1];
	const t = Math.max(
		0,
		Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / (dx * dx + dy * dy))
	);
	return Math.hypot(a[0] + t * dx - p[0], a[1] + t * dy - p[1]);
}
function distToLine(p: Pt, pts: Pt[]) {
	let d = Infinity;
	for (let i = 0; i < pts.length - 1; i++) d = Math.min(d, distToSeg(p, pts[i], pts[i + 1]));
	return d;
}
function distToRing(p: Pt, ring: Pt[]) {
	return distToLine(p, [...ring, ring[0]]);
}
function inRing(p: Pt, ring: Pt[]) {
	let c = false;
	for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
		const [xi, yi] = ring[i];
		const [xj, yj] = ring[j];
		if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) c = !c;
	}
	return c;
}

const LOOP = { west: 60, east: 150, cy: 85, r: 45 };
const COURT = { x: 10, cy: -78, r: 13 };

function context(): Feature[] {
	const f: Feature[] = [];
	// Streets run well past the neighbourhood so the imagery never shows a road stopping dead.
	const streets: [string, number, number, number, Pt[]][] = [
		[
			'Tidewater Lane',
			9,
			1.5,
			1.0,
			[
				[-260, 1.5],
				[-120, 0.5],
				[0, 0],
				[120, -0.5],
				[260, -2]
			]
		],
		[
			'Alder Loop',
			7.5,
			1.5,
			1.0,
			[
				[LOOP.west, 0],
				[LOOP.west, LOOP.cy],
				...arc((LOOP.west + LOOP.east) / 2, LOOP.cy, LOOP.r, 180, 0, 36).slice(1, -1),
				[LOOP.east, LOOP.cy],
				[LOOP.east, 0]
			]
		],
		['Saltmarsh Court', 7, 0, 0, [[COURT.x, 0], ...arc(COURT.x, COURT.cy, COURT.r, 90, 450, 48)]]
	];
	for (const [name, widthM, sidewalkM, vergeM, pts] of streets)
		f.push(line({ kind: 'street', name, widthM, sidewalkM, vergeM }, pts));

	const parcels: [string, Pt[], string][] = [
		['h01', rect(-136, -56, -100, -6.75), 'lush'],
		['h02', rect(-100, -56, -64, -6.75), 'fresh'],
		['h03', rect(-64, -56, -30, -6.75), 'dry'],
		['h04', rect(0, 28, 53.25, 66), 'fresh'],
		['h05', [[84, 178], ...arc(105, LOOP.cy, LOOP.r + 6.25, 113, 67, 8), [126, 178]], 'lush'],
		['h06', rect(66.75, 40, 105, 85), 'lush'],
		['h07', rect(105, 40, 143.25, 85), 'dry'],
		['h08', rect(-46, -100, -9, -64), 'lush'],
		['h09', rect(-14, -130, 27, -99), 'fresh'],
		['h10', rect(27, -100, 70, -60), 'dry']
	];
	for (const [houseId, ring, lawn] of parcels)
		f.push(polygon({ kind: 'parcel', houseId, lawn }, ring));
	f.push(
		polygon(
			{ kind: 'lawn', name: 'Alder Loop green', lawn: 'fresh' },
			rect(66.75, 7.25, 143.25, 38)
		),
		polygon(
			{ kind: 'lawn', name: 'Saltmarsh Court island', lawn: 'lush' },
			arc(COURT.x, COURT.cy, 8.2, 0, 360, 40).slice(0, -1)
		)
	);

	const drive = (houseId: string, surface: string, ring: Pt[]) =>
		f.push(polygon({ kind: 'driveway', houseId, surface }, ring));
	drive('h01', 'concrete', rect(-110.5, -30, -106.5, -3));
	drive('h02', 'asphalt', rect(-73.6, -28, -69.6, -3));
	drive('h03', 'concrete', rect(-61.5, -24, -56, -3));
	drive('h04', 'concrete', rect(43, 42.2, 58, 46.8));
	drive('h05', 'pavers', [
		[113.5, 160],
		[113.5, 128],
		[117.5, 127],
		[117.5, 160]
	]);
	drive('h06', 'concrete', rect(58, 70, 87, 74));
	drive('h07', 'asphalt', rect(128, 50, 152, 54));
	drive('h08', 'concrete', rect(-24, -75, -1, -71));
	drive('h09', 'concrete', rect(0, -106.5, 4, -88));
	drive('h10', 'concrete', rect(17, -69.2, 42, -64.8));

	f.push(
		polygon({ kind: 'pool', houseId: 'h04', deckM: 1.4 }, roundedRect(8.5, 41, 16.5, 46.5, 1.0)),
		line({ kind: 'fence', houseId: 'h04', heightM: 1.5, style: 'vinyl' }, [
			[23.2, 38.5],
			[4, 38.5],
			[4, 52.5],
			[23.2, 52.5]
		]),
		line({ kind: 'fence', houseId: 'h03', heightM: 1.8, style: 'wood' }, [
			[-34.6, -9.5],
			[-34.6, -50],
			[-63.5, -50]
		])
	);

	const shrubs: [Pt, number, string?][] = [
		// Hydrangeas in the 1.4 m strip between h03's east wall and its fence.
		[[-35.3, -18.2], 0.6, 'h03'],
		[[-35.3, -20.4], 0.65, 'h03'],
		[[-35.3, -22.8], 0.6, 'h03'],
		[[-35.3, -25.4], 0.6, 'h03'],
		[[-35.3, -28.1], 0.65, 'h03'],
		[[-35.3, -30.4], 0.55, 'h03'],
		[[-86, -17.8], 0.8, 'h02'],
		[[-83.4, -17.8], 0.7, 'h02'],
		[[-78.2, -17.8], 0.8, 'h02'],
		[[79.4, 58], 0.8, 'h06'],
		[[79.4, 66], 0.8, 'h06'],
		[[15.8, -105.4], 0.9, 'h09'],
		[[6.5, -105.5], 0.7, 'h09'],
		[[20, 54], 1.0, 'h04'],
		[[100, 146.6], 0.8, 'h05'],
		[[110, 146.6], 0.8, 'h05']
	];
	shrubs.forEach(([p, radiusM, houseId], i) =>
		f.push(
			point(
				{
					kind: 'shrub',
					shrubId: `s${String(i + 1).padStart(2, '0')}`,
					radiusM,
					...(houseId ? { houseId } : {})
				},
				p
			)
		)
	);

	const trees: [Pt, number, number, 'broadleaf' | 'conifer', string?][] = [
		[[-122.5, -15.5], 6.5, 13, 'broadleaf', 'h01'],
		[[-36.5, -80], 5.5, 16, 'conifer', 'h08'],
		[[-70, -46], 4.5, 9, 'broadleaf'],
		[[-129, -46], 5, 11, 'broadleaf'],
		[[-122, 10], 3.6, 8, 'broadleaf'],
		[[-92, 10], 3.6, 8, 'broadleaf'],
		[[-62, 10], 3.6, 8, 'broadleaf'],
		[[-32, 10], 3.6, 8, 'broadleaf'],
		[[-2, 10], 3.6, 8, 'broadleaf'],
		[[COURT.x, COURT.cy], 4, 8, 'broadleaf'],
		[[51, 59], 4, 9, 'broadleaf'],
		[[90, 168], 5, 12, 'conifer'],
		[[121, 170], 4, 10, 'broadleaf'],
		[[107, 50], 5.5, 13, 'broadleaf'],
		[[106, 79], 4, 10, 'conifer'],
		[[-3, -121], 5, 11, 'broadleaf'],
		[[61, -76], 5, 12, 'broadleaf'],
		[[90, 20], 4.5, 10, 'broadleaf'],
		[[125, 24], 4, 9, 'conifer']
	];
	// Woods and hedgerow trees fill the open ground between parcels, as in any leafy suburb.
	// They keep clear of parcels, greens, streets and each other, so none reaches a roof.
	const keepOut = [...parcels.map(([, ring]) => ring), rect(66.75, 7.25, 143.25, 38)];
	const rnd = mulberry32(0x77e3f1ed);
	const scatter: [Pt[], number][] = [
		[rect(-138, 14, -8, 132), 34],
		[rect(-6, 72, 56, 132), 9],
		[rect(-138, -78, -28, -60), 9],
		[rect(-60, -134, 70, -102), 8],
		[rect(72, 92, 138, 124), 5]
	];
	for (const [area, count] of scatter) {
		let placed = 0;
		for (let tries = 0; placed < count && tries < 4000; tries++) {
			const [x0, y0] = area[0];
			const [x1, y1] = area[2];
			const p: Pt = [x0 + rnd() * (x1 - x0), y0 + rnd() * (y1 - y0)];
			const r = 2.8 + rnd() * 3.4;
			const conifer = rnd() < 0.3;
			if (keepOut.some((ring) => distToRing(p, ring) < r + 1.5 || inRing(p, ring))) continue;
			if (
				streets.some(
					([, w, walk, verge, pts]) => distToLine(p, pts) < w / 2 + walk + verge + r * 0.6
				)
			)
				continue;
			if (trees.some(([q, rq]) => Math.hypot(q[0] - p[0], q[1] - p[1]) < (r + rq) * 0.8)) continue;
			if (Math.hypot(p[0] - 105, p[1] - LOOP.cy) > LOOP.r - 7 - r && area === scatter[4][0])
				continue;
			trees.push([
				p,
				Math.round(r * 10) / 10,
				Math.round((r * 2.1 + 2 + rnd() * 4) * 10) / 10,
				conifer ? 'conifer' : 'broadleaf'
			]);
			placed++;
		}
	}
	trees.forEach(([p, crownRadiusM, heightM, form, overhangs], i) =>
		f.push(
			point(
				{
					kind: 'tree',
					treeId: `t${String(i + 1).padStart(2, '0')}`,
					crownRadiusM,
					heightM,
					form,
					...(overhangs ? { overhangs } : {})
				},
				p
			)
		)
	);
	return f;
}

// ---------------------------------------------------------------------------------------------
// Assembly

export function buildScene() {
	const features: Feature[] = [];
	for (const h of HOUSES) {
		const centreLL = sceneLL(h.centre);
		const hp = plane(centreLL[1], centreLL[0]);
		const placed = place(h);
		const facets = placed.map((p, k) => {
			const ll = p.xy.map((v) => roundLL(hp.toLonLat(v)));
			const ring = [...ll, ll[0]];
			const plan = geodesicArea(ring);
			const mult = Math.sqrt(1 + (p.def.pitch / 12) ** 2);
			let eave = 0;
			p.def.edges.forEach((e, i) => {
				if (e === 'eave') eave += geodesicLength(ring[i], ring[i + 1]);
			});
			const props = {
				kind: 'facet',
				houseId: h.id,
				facetId: `${h.id}-f${k + 1}`,
				label: p.label,
				section: p.def.section,
				pitch: p.def.pitch,
				material: p.def.material,
				growth: p.def.growth,
				access: p.def.access,
				stories: p.def.stories,
				edges: p.def.edges,
				shade: p.def.shade,
				eaveHeightM: p.def.eaveHeightM,
				downslopeAzimuthDeg: r3(p.azimuth),
				planAreaM2: r6(plan),
				planAreaFt2: r6(plan * FT2_PER_M2),
				slopedAreaFt2: r6(plan * FT2_PER_M2 * mult),
				eaveLengthFt: r6(eave * FT_PER_M),
				...(p.def.notes ? { notes: p.def.notes } : {})
			};
			return {
				type: 'Feature' as const,
				properties: props,
				geometry: { type: 'Polygon' as const, coordinates: [ring] }
			};
		});
		const sum = (k: 'planAreaFt2' | 'slopedAreaFt2' | 'eaveLengthFt') =>
			r6(facets.reduce((s, f) => s + f.properties[k], 0));
		const sloped = sum('slopedAreaFt2');
		features.push(
			{
				type: 'Feature',
				properties: {
					kind: 'house',
					houseId: h.id,
					address: `${h.number} ${h.street}, ${TOWN}`,
					street: h.street,
					town: TOWN,
					customer: h.customer,
					lat: centreLL[1],
					lon: centreLL[0],
					roofType: h.roofType,
					materials: [...new Set(h.facets.map((d) => d.material))],
					stories: Math.max(...h.facets.map((d) => d.stories)),
					noGutters: h.noGutters,
					facetCount: facets.length,
					planAreaFt2: sum('planAreaFt2'),
					slopedAreaFt2: sloped,
					squares: r6(sloped / 100),
					eaveLengthFt: sum('eaveLengthFt'),
					notes: h.notes
				},
				geometry: { type: 'Point', coordinates: centreLL }
			},
			...facets
		);
	}
	features.push(...context());

	let [w, s, e, n] = [Infinity, Infinity, -Infinity, -Infinity];
	const grow = ([lon, lat]: Pt) => {
		w = Math.min(w, lon);
		e = Math.max(e, lon);
		s = Math.min(s, lat);
		n = Math.max(n, lat);
	};
	for (const f of features) {
		// Streets are drawn long on purpose and would stretch the extent for nothing.
		if (f.properties.kind === 'street') continue;
		const g = f.geometry;
		if (g.type === 'Point') grow(g.coordinates);
		else if (g.type === 'LineString') g.coordinates.forEach(grow);
		else g.coordinates[0].forEach(grow);
	}
	return {
		type: 'FeatureCollection' as const,
		name: 'Wrenfield sample neighbourhood',
		origin: [ORIGIN.lon, ORIGIN.lat],
		bbox: [w, s, e, n].map(round9),
		features
	};
}

/** JSON with one coordinate pair (or any short list of plain values) per line. */
export function pretty(v: unknown, ind = ''): string {
	if (Array.isArray(v)) {
		if (v.every((x) => x === null || typeof x !== 'object'))
			return '[' + v.map((x) => JSON.stringify(x)).join(', ') + ']';
		const inner = ind + '\t';
		return '[\n' + v.map((x) => inner + pretty(x, inner)).join(',\n') + '\n' + ind + ']';
	}
	if (v && typeof v === 'object') {
		const inner = ind + '\t';
		const body = Object.entries(v)
			.filter(([, x]) => x !== undefined)
			.map(([k, x]) => inner + JSON.stringify(k) + ': ' + pretty(x, inner));
		return '{\n' + body.join(',\n') + '\n' + ind + '}';
	}
	return JSON.stringify(v);
}

export const SCENE_PATH = fileURLToPath(new URL('./scene.geojson', import.meta.url));

function main() {
	const scene = buildScene();
	writeFileSync(SCENE_PATH, pretty(scene) + '\n');
	const rows = scene.features
		.filter((f) => f.properties.kind === 'house')
		.map((f) => {
			const p = f.properties as Record<string, unknown>;
			return `| ${p.houseId} | ${p.address} | ${p.roofType} | ${(p.materials as string[]).join(', ')} | ${p.facetCount} | ${(p.slopedAreaFt2 as number).toFixed(1)} |`;
		});
	console.log(`wrote ${SCENE_PATH} (${scene.features.length} features)`);
	console.log(rows.join('\n'));
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) main();
