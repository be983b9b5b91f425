/** Flattens a JSON Schema into rows a person can read: one per field, dotted like the API's issue paths. */

type Schema = {
	type?: string | string[];
	properties?: Record<string, Schema>;
	required?: string[];
	items?: Schema | false;
	prefixItems?: Schema[];
	anyOf?: Schema[];
	enum?: unknown[];
	const?: unknown;
	format?: string;
	minimum?: number;
	maximum?: number;
	minLength?: number;
	maxLength?: number;
	minItems?: number;
	maxItems?: number;
	default?: unknown;
	description?: string;
};

export interface SchemaRow {
	path: string;
	type: string;
	required: boolean;
	notes: string;
}

const nonNull = (s: Schema[]) => s.filter((x) => x.type !== 'null');

function typeOf(s: Schema): string {
	if (s.const !== undefined) return JSON.stringify(s.const);
	if (s.enum) return s.enum.map((v) => JSON.stringify(v)).join(' | ');
	if (s.anyOf) {
		const parts = s.anyOf.map(typeOf);
		return [...new Set(parts)].join(' | ');
	}
	if (s.type === 'array') {
		if (s.prefixItems) return `[${s.prefixItems.map(typeOf).join(', ')}${s.items ? ', …' : ''}]`;
		return s.items ? `${typeOf(s.items)}[]` : 'array';
	}
	if (s.format) return `${s.type} (${s.format})`;
	return Array.isArray(s.type) ? s.type.join(' | ') : (s.type ?? 'any');
}

function notesOf(s: Schema): string {
	const out: string[] = [];
	if (s.minimum !== undefined && s.maximum !== undefined) out.push(`${s.minimum} to ${s.maximum}`);
	else if (s.minimum !== undefined) out.push(`≥ ${s.minimum}`);
	else if (s.maximum !== undefined) out.push(`≤ ${s.maximum}`);
	if (s.maxLength !== undefined) out.push(`up to ${s.maxLength} characters`);
	if (
		s.minItems !== undefined &&
		s.maxItems !== undefined &&
		s.type === 'array' &&
		!s.prefixItems
	) {
		out.push(
			s.minItems === s.maxItems ? `exactly ${s.minItems}` : `${s.minItems} to ${s.maxItems} items`
		);
	} else if (s.maxItems !== undefined && s.type === 'array' && !s.prefixItems) {
		out.push(`at most ${s.maxItems} items`);
	} else if (s.minItems !== undefined && s.type === 'array' && !s.prefixItems) {
		out.push(`at least ${s.minItems} items`);
	}
	if (s.default !== undefined) out.push(`default ${JSON.stringify(s.default)}`);
	if (s.description) out.push(s.description);
	return out.join('; ');
}

export function schemaRows(schema: Schema, prefix = '', depth = 0, rows: SchemaRow[] = []) {
	const required = new Set(schema.required ?? []);
	for (const [name, raw] of Object.entries(schema.properties ?? {})) {
		const options = raw.anyOf ? nonNull(raw.anyOf) : [raw];
		const s =
			options.length === 1
				? { ...options[0], description: raw.description ?? options[0].description }
				: raw;
		const path = prefix ? `${prefix}.${name}` : name;
		const nullable = raw.anyOf?.some((x) => x.type === 'null');
		rows.push({
			path,
			type: typeOf(s) + (nullable ? ' | null' : ''),
			required: required.has(name),
			notes: notesOf(s)
		});
		if (depth >= 4) continue;
		if (s.type === 'object' && s.properties) schemaRows(s, path, depth + 1, rows);
		if (s.type === 'array' && s.items && s.items.type === 'object') {
			schemaRows(s.items, `${path}.N`, depth + 1, rows);
		}
	}
	return rows;
}
