import { requireRole } from '$lib/server/auth/guard';
import { MAX_JSON_BYTES } from '$lib/server/api/body';
import { openApiDocument } from '$lib/server/openapi';
import { schemaRows, type SchemaRow } from './schema-rows';
import type { PageServerLoad } from './$types';

type Op = {
	summary?: string;
	description?: string;
	parameters?: {
		name: string;
		in: string;
		required?: boolean;
		description?: string;
		schema: object;
	}[];
	requestBody?: { content: Record<string, { schema: { $ref: string }; example?: unknown }> };
	responses: Record<
		string,
		{
			description: string;
			content?: Record<string, { schema: { $ref: string }; example?: unknown }>;
		}
	>;
};

const refName = (ref: string | undefined) => ref?.split('/').pop();

/** The OpenAPI document, reshaped for reading: the page renders exactly what /api/openapi.json says. */
export const load: PageServerLoad = (event) => {
	requireRole(event, 'owner', 'estimator', 'sales');
	const doc = openApiDocument();
	const schemas = doc.components.schemas as Record<string, object>;
	const endpoints = Object.entries(doc.paths).flatMap(([path, item]) => {
		const shared = ((item as { parameters?: Op['parameters'] }).parameters ?? []).map((p) => ({
			...p,
			required: p.required ?? false
		}));
		return (['get', 'post', 'patch'] as const)
			.filter((m) => m in item)
			.map((method) => {
				const op = (item as Record<string, Op>)[method];
				const body = op.requestBody?.content['application/json'];
				const params = [...shared, ...(op.parameters ?? [])].map((p) => ({
					name: p.name,
					in: p.in,
					required: p.required ?? false,
					type: schemaRows({ properties: { x: p.schema } } as never)[0]?.type ?? '',
					notes: [schemaRows({ properties: { x: p.schema } } as never)[0]?.notes, p.description]
						.filter(Boolean)
						.join('. ')
				}));
				const responses = Object.entries(op.responses).map(([status, r]) => ({
					status,
					description: r.description,
					schema: refName(r.content?.['application/json']?.schema.$ref),
					example: r.content?.['application/json']?.example
				}));
				return {
					id: `${method}-${path.replace(/[^a-z]+/gi, '-')}`.replace(/-+$/, ''),
					method: method.toUpperCase(),
					path,
					summary: op.summary ?? '',
					description: (op.description ?? '').replaceAll('`', ''),
					params,
					body: body ? { schema: refName(body.schema.$ref)!, example: body.example } : null,
					responses
				};
			});
	});
	const fields: Record<string, SchemaRow[]> = {};
	for (const name of ['EstimateRequest', 'EstimatePriced', 'EstimatePatch', 'Error']) {
		fields[name] = schemaRows(schemas[name] as never);
	}
	return {
		title: doc.info.title,
		version: doc.info.version,
		intro: doc.info.description.replaceAll('`', ''),
		endpoints,
		fields,
		limitKb: MAX_JSON_BYTES / 1024,
		origin: event.url.origin
	};
};
