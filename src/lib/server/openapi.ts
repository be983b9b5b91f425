import { z } from 'zod';
import { estimateRequestSchema } from '../schemas/estimate';
import { facetSchema } from '../schemas/facet';
import { savePlanSchema } from '../schemas/roof-plan';
import { rateCardSchema } from '../schemas/rate-card';
import { MAX_JSON_BYTES } from './api/body';
import { EXAMPLE_ERROR, EXAMPLE_REQUEST, exampleResponse } from './api/examples';
import {
	apiErrorSchema,
	estimateDetailSchema,
	estimateListQuerySchema,
	estimateListSchema,
	estimatePatchSchema,
	estimatePricedSchema,
	rateCardListSchema
} from '../schemas/estimates-api';

type JsonSchema = Record<string, unknown>;

/** JSON Schema 2020-12, which OpenAPI 3.1 uses as is, minus the per-document $schema. */
function schemaOf(schema: z.ZodType, io: 'input' | 'output'): JsonSchema {
	const { $schema: _drop, ...rest } = z.toJSONSchema(schema, {
		target: 'draft-2020-12',
		io,
		unrepresentable: 'any'
	}) as JsonSchema;
	return rest;
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });

const errorResponse = (description: string) => ({
	description,
	content: { 'application/json': { schema: ref('Error') } }
});

const COMMON_ERRORS = {
	'401': errorResponse('Not signed in, or the API token is unknown or revoked.'),
	'403': errorResponse('Your role may not do this.')
};

function queryParameters() {
	const shape = estimateListQuerySchema.shape;
	return Object.entries(shape).map(([name, field]) => {
		const schema = schemaOf(field as z.ZodType, 'input');
		const { description, ...rest } = schema;
		return { name, in: 'query', required: false, description, schema: rest };
	});
}

function build() {
	return {
		openapi: '3.1.0',
		info: {
			title: 'Clearpitch API',
			version: '1.0.0',
			description:
				'Price soft-wash roof estimates from a roof plan, store them as drafts for a site, and ' +
				'move them along draft → ready → sent → accepted → scheduled → done → paid (or declined / ' +
				'expired). JSON in and out. Every 4xx answer is `{ message, issues? }`; each issue names ' +
				`one bad field by its dotted path (facets.0.pitch). Bodies over ${MAX_JSON_BYTES / 1024} KB ` +
				'are refused with 413, other content types than application/json with 415. Prices are ' +
				'integer cents; areas are ft² at full precision. Estimates and reminders only: defer to ' +
				'local codes, the product label and safety data sheet, and licensed practice.'
		},
		servers: [{ url: '/' }],
		security: [{ bearerToken: [] }, { session: [] }],
		tags: [
			{ name: 'Estimates', description: 'Price a roof plan; list, read and move estimates.' },
			{ name: 'Rate cards', description: "The owner's rate-card versions." },
			{
				name: 'Roof plans',
				description:
					'Save a site’s roof plan as its next version. Its facets have the same shape as an estimate’s (Facet).'
			}
		],
		paths: {
			'/api/estimates': {
				post: {
					tags: ['Estimates'],
					operationId: 'priceEstimate',
					summary: 'Price a roof plan, and optionally save it as a draft estimate',
					description:
						'Prices with the latest rate-card version unless `rateCardId` names another. With ' +
						'`"save": true` (and a `siteId` of one of your sites) the estimate is stored as a ' +
						'draft; it keeps its input, price and rate-card version whatever changes later.\n\n' +
						'Send the roof as `facets` or as `roofPlanId`. With `roofPlanId` the server prices the ' +
						'facets saved in that roof-plan version and stores them with the estimate; the plan ' +
						'must be one of your roof plans and, when `siteId` is sent, a plan of that site ' +
						'(otherwise a 400 on `roofPlanId`, and nothing is written). Facets sent together ' +
						'with a `roofPlanId` must be that plan’s facets, in its order (labels compared ' +
						'trimmed), or the answer is a 400 on `facets`: the server never guesses which of ' +
						'the two was meant. Saving a plan as a draft: ' +
						'`{ "siteId": "…", "roofPlanId": "…", "save": true }`, with any of the other ' +
						'fields.',
					requestBody: {
						required: true,
						content: {
							'application/json': {
								schema: ref('EstimateRequest'),
								example: EXAMPLE_REQUEST
							}
						}
					},
					responses: {
						'200': {
							description: 'Priced (not saved).',
							content: {
								'application/json': { schema: ref('EstimatePriced'), example: exampleResponse() }
							}
						},
						'201': {
							description: 'Priced and saved as a draft; `estimate` holds its id and status.',
							content: { 'application/json': { schema: ref('EstimatePriced') } }
						},
						'400': {
							description:
								'Invalid JSON, or fields that fail validation (wrong type, out of range, a ' +
								'self-crossing outline, roof access on fragile tile…).',
							content: { 'application/json': { schema: ref('Error'), example: EXAMPLE_ERROR } }
						},
						...COMMON_ERRORS,
						'409': errorResponse('The company has no rate card yet.'),
						'413': errorResponse(`The body is over ${MAX_JSON_BYTES / 1024} KB.`),
						'415': errorResponse('The body is not sent as application/json.')
					}
				},
				get: {
					tags: ['Estimates'],
					operationId: 'listEstimates',
					summary: 'List saved estimates, newest first',
					parameters: queryParameters(),
					responses: {
						'200': {
							description: 'One page of estimates and the total that match.',
							content: { 'application/json': { schema: ref('EstimateList') } }
						},
						'400': errorResponse('A query parameter is invalid.'),
						...COMMON_ERRORS
					}
				}
			},
			'/api/estimates/{id}': {
				parameters: [
					{ name: 'id', in: 'path', required: true, schema: { type: 'string', format: 'uuid' } }
				],
				get: {
					tags: ['Estimates'],
					operationId: 'getEstimate',
					summary: 'One estimate with its frozen input and result',
					responses: {
						'200': {
							description: 'The estimate.',
							content: { 'application/json': { schema: ref('EstimateDetail') } }
						},
						...COMMON_ERRORS,
						'404': errorResponse('No estimate with this id in your company.')
					}
				},
				patch: {
					tags: ['Estimates'],
					operationId: 'changeEstimateStatus',
					summary: 'Move an estimate to another status',
					description:
						'Allowed moves: draft → ready (owner, estimator); ready → sent (owner, sales), ready → ' +
						'draft (owner, estimator), ready → expired; sent → accepted, declined or expired ' +
						'(owner, sales); done → paid (owner). Scheduling (accepted → scheduled) and closing a ' +
						'job (scheduled → done) carry a date, crew and log, so they are made on the Schedule ' +
						'page and the crew sheet, and this endpoint answers them 409. Any other move is 409.',
					requestBody: {
						required: true,
						content: {
							'application/json': { schema: ref('EstimatePatch'), example: { status: 'ready' } }
						}
					},
					responses: {
						'200': {
							description: 'The estimate after the move.',
							content: { 'application/json': { schema: ref('EstimateDetail') } }
						},
						'400': errorResponse('The body is not `{ "status": … }` with a known status.'),
						...COMMON_ERRORS,
						'404': errorResponse('No estimate with this id in your company.'),
						'409': errorResponse('That move is not allowed from the current status.'),
						'413': errorResponse(`The body is over ${MAX_JSON_BYTES / 1024} KB.`),
						'415': errorResponse('The body is not sent as application/json.')
					}
				}
			},
			'/api/roof-plans': {
				post: {
					tags: ['Roof plans'],
					operationId: 'saveRoofPlan',
					summary: 'Save a roof plan as the site’s next version',
					description:
						'A refused body writes nothing. Messages about one facet start with its number and label: "Facet 3 (Garage south slope): the outline crosses itself".',
					requestBody: {
						required: true,
						content: { 'application/json': { schema: ref('RoofPlanSave') } }
					},
					responses: {
						'201': {
							description: 'Saved: `{ plan }` with its id and version; `Location` names it.'
						},
						'400': errorResponse('The plan has problems; `issues` names each one.'),
						...COMMON_ERRORS,
						'404': errorResponse('No such site.'),
						'409': errorResponse('A newer version was saved since `baseVersion`.')
					}
				}
			},
			'/api/rate-cards': {
				get: {
					tags: ['Rate cards'],
					operationId: 'listRateCards',
					summary: 'Rate-card versions with their figures, newest first',
					responses: {
						'200': {
							description: 'Every version; the first is the one new estimates use.',
							content: { 'application/json': { schema: ref('RateCardList') } }
						},
						...COMMON_ERRORS
					}
				}
			}
		},
		components: {
			securitySchemes: {
				bearerToken: {
					type: 'http',
					scheme: 'bearer',
					description:
						'An API token an owner creates on the Team page: `Authorization: Bearer cp_…`. It acts with its creator’s role.'
				},
				session: {
					type: 'apiKey',
					in: 'cookie',
					name: 'cp_session',
					description: 'The browser session of a signed-in user.'
				}
			},
			schemas: {
				Facet: schemaOf(facetSchema, 'input'),
				RoofPlanSave: schemaOf(savePlanSchema, 'input'),
				EstimateRequest: schemaOf(estimateRequestSchema, 'input'),
				EstimatePriced: schemaOf(estimatePricedSchema, 'output'),
				EstimateList: schemaOf(estimateListSchema, 'output'),
				EstimateDetail: schemaOf(estimateDetailSchema, 'output'),
				EstimatePatch: schemaOf(estimatePatchSchema, 'input'),
				RateCard: schemaOf(rateCardSchema, 'output'),
				RateCardList: schemaOf(rateCardListSchema, 'output'),
				Error: schemaOf(apiErrorSchema, 'output')
			}
		}
	};
}

export type OpenApiDocument = ReturnType<typeof build>;

let doc: OpenApiDocument | undefined;

/** Built once per process from the zod schemas the handlers use. */
export function openApiDocument(): OpenApiDocument {
	doc ??= build();
	return doc;
}
