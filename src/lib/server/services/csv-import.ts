import { randomUUID } from 'node:crypto';
import { and, eq, inArray } from 'drizzle-orm';
import { parseCsv, CsvUnreadable, type CsvTable } from '../../csv/cells';
import {
	CUSTOMER_COLUMNS,
	MAX_IMPORT_ROWS,
	SITE_COLUMNS,
	SITE_FLAG_COLUMNS,
	customerRowSchema,
	siteRowSchema,
	type CustomerRow,
	type SiteRow
} from '../../schemas/csv-import';
import type { SiteFlags } from '../db/schema';
import { getDb, tidyAfterBulkLoad, type Db } from '../db';
import { customers, sites } from '../db/schema';
import { Invalid } from './errors';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Reader = Db | Tx;

export type ImportFile = 'customers' | 'sites';

/** One problem, by file, line (0: the file as a whole) and column. */
export interface ImportProblem {
	file: ImportFile;
	line: number;
	column: string;
	message: string;
}

export interface ImportPreview {
	customers: {
		line: number;
		ref: string;
		name: string;
		email: string | null;
		phone: string | null;
	}[];
	sites: { line: number; customerRef: string; address: string; lat: number; lon: number }[];
	counts: { customers: number; sites: number };
	problems: ImportProblem[];
}

/** Shown in full on the page; the count says how many more there are. */
const SHOWN = 200;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function readTable(
	file: ImportFile,
	text: string,
	columns: readonly string[],
	problems: ImportProblem[]
): CsvTable | null {
	if (text.trim() === '') return null;
	let table: CsvTable;
	try {
		table = parseCsv(text);
	} catch (e) {
		if (!(e instanceof CsvUnreadable)) throw e;
		problems.push({ file, line: e.line ?? 0, column: '', message: e.message });
		return null;
	}
	const seen = new Set<string>();
	for (const h of table.header) {
		if (seen.has(h))
			problems.push({ file, line: 1, column: h, message: `Column "${h}" appears twice.` });
		else if (!columns.includes(h))
			problems.push({ file, line: 1, column: h, message: `Unknown column "${h}".` });
		seen.add(h);
	}
	const missing = columns.filter((c) => !seen.has(c));
	if (missing.length) {
		problems.push({
			file,
			line: 1,
			column: missing.join(', '),
			message: `Missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}. The header row needs ${columns.join(', ')}.`
		});
	}
	if (table.rows.length > MAX_IMPORT_ROWS) {
		problems.push({
			file,
			line: 0,
			column: '',
			message: `The file has ${table.rows.length} rows; import at most ${MAX_IMPORT_ROWS} at a time.`
		});
	}
	if (table.rows.length === 0) {
		problems.push({ file, line: 0, column: '', message: 'The file has a header row but no rows.' });
	}
	return problems.some((p) => p.file === file) ? null : table;
}

/** Each row as the zod schema reads it, or its problems. */
function readRows<T>(
	file: ImportFile,
	table: CsvTable,
	schema: {
		safeParse(
			v: unknown
		):
			| { success: true; data: T }
			| { success: false; error: { issues: { path: PropertyKey[]; message: string }[] } };
	},
	problems: ImportProblem[]
): { line: number; row: T }[] {
	const out: { line: number; row: T }[] = [];
	for (const { line, cells } of table.rows) {
		if (cells.length !== table.header.length) {
			problems.push({
				file,
				line,
				column: '',
				message: `The row has ${cells.length} cells; the header has ${table.header.length}.`
			});
			continue;
		}
		const parsed = schema.safeParse(Object.fromEntries(table.header.map((h, i) => [h, cells[i]])));
		if (parsed.success) out.push({ line, row: parsed.data });
		else {
			for (const issue of parsed.error.issues) {
				problems.push({
					file,
					line,
					column: issue.path.map(String).join('.'),
					message: issue.message
				});
			}
		}
	}
	return out;
}

type Checked = {
	customers: { line: number; row: CustomerRow }[];
	sites: { line: number; row: SiteRow }[];
	/** customer_ref → an existing customer of the company, for sites of customers already here. */
	existing: Set<string>;
	problems: ImportProblem[];
};

async function check(
	db: Reader,
	companyId: string,
	input: { customers: string; sites: string }
): Promise<Checked> {
	const problems: ImportProblem[] = [];
	if (input.customers.trim() === '' && input.sites.trim() === '') {
		problems.push({
			file: 'customers',
			line: 0,
			column: '',
			message: 'Choose a customers file, a sites file, or both.'
		});
	}
	const ct = readTable('customers', input.customers, CUSTOMER_COLUMNS, problems);
	const st = readTable('sites', input.sites, SITE_COLUMNS, problems);
	const cs = ct ? readRows('customers', ct, customerRowSchema, problems) : [];
	const ss = st ? readRows('sites', st, siteRowSchema, problems) : [];

	const refs = [...new Set([...cs, ...ss].map((r) => r.row.customer_ref))].filter((r) =>
		UUID.test(r)
	);
	const existing = new Set(
		refs.length
			? (
					await db
						.select({ id: customers.id })
						.from(customers)
						.where(and(eq(customers.companyId, companyId), inArray(customers.id, refs)))
				).map((c) => c.id)
			: []
	);
	const inFile = new Map<string, number>();
	for (const { line, row } of cs) {
		const first = inFile.get(row.customer_ref);
		if (first !== undefined) {
			problems.push({
				file: 'customers',
				line,
				column: 'customer_ref',
				message: `customer_ref "${row.customer_ref}" is already used on line ${first}.`
			});
		} else if (existing.has(row.customer_ref)) {
			problems.push({
				file: 'customers',
				line,
				column: 'customer_ref',
				message:
					'This customer is already in Clearpitch (it was exported from here); remove the row.'
			});
		} else inFile.set(row.customer_ref, line);
	}
	for (const { line, row } of ss) {
		if (!inFile.has(row.customer_ref) && !existing.has(row.customer_ref)) {
			problems.push({
				file: 'sites',
				line,
				column: 'customer_ref',
				message: `No customer "${row.customer_ref}" in the customers file or in Clearpitch.`
			});
		}
	}
	problems.sort((a, b) => a.file.localeCompare(b.file) || a.line - b.line);
	return { customers: cs, sites: ss, existing, problems };
}

/** What an import would add, and every problem that stops it; writes nothing. */
export async function previewImport(
	companyId: string,
	input: { customers: string; sites: string }
): Promise<ImportPreview> {
	const c = await check(await getDb(), companyId, input);
	return {
		customers: c.customers.slice(0, SHOWN).map(({ line, row }) => ({
			line,
			ref: row.customer_ref,
			name: row.name,
			email: row.email,
			phone: row.phone
		})),
		sites: c.sites.slice(0, SHOWN).map(({ line, row }) => ({
			line,
			customerRef: row.customer_ref,
			address: row.address,
			lat: row.lat,
			lon: row.lon
		})),
		counts: { customers: c.customers.length, sites: c.sites.length },
		problems: c.problems.slice(0, SHOWN)
	};
}

function flagsOf(row: SiteRow): SiteFlags {
	const flags: SiteFlags = {};
	for (const [col, key] of Object.entries(SITE_FLAG_COLUMNS)) {
		const v = row[col as keyof typeof SITE_FLAG_COLUMNS];
		if (v !== undefined) flags[key] = v;
	}
	return flags;
}

/** Inserted in slices: one statement's parameters stay well under PostgreSQL's 65,535. */
const SLICE = 500;

/**
 * Adds every row of both files in one transaction, checked again inside it: any problem and
 * nothing is written (`Invalid`, with each problem as an issue `file:line:column`).
 */
export async function importCsv(
	companyId: string,
	input: { customers: string; sites: string }
): Promise<{ customers: number; sites: number }> {
	const db = await getDb();
	const added = await db.transaction(async (tx) => {
		const c = await check(tx, companyId, input);
		if (c.problems.length) {
			throw new Invalid(
				`Nothing was imported: the files have ${c.problems.length === 1 ? 'a problem' : `${c.problems.length} problems`}.`,
				c.problems.map((p) => ({ path: `${p.file}:${p.line}:${p.column}`, message: p.message }))
			);
		}
		const ids = new Map<string, string>([...c.existing].map((id) => [id, id]));
		// Ids made here, not read back from RETURNING, whose row order PostgreSQL does not promise.
		for (const { row } of c.customers) ids.set(row.customer_ref, randomUUID());
		for (let i = 0; i < c.customers.length; i += SLICE) {
			await tx.insert(customers).values(
				c.customers.slice(i, i + SLICE).map(({ row }) => ({
					id: ids.get(row.customer_ref)!,
					companyId,
					name: row.name,
					email: row.email,
					phone: row.phone,
					notes: row.notes
				}))
			);
		}
		for (let i = 0; i < c.sites.length; i += SLICE) {
			await tx.insert(sites).values(
				c.sites.slice(i, i + SLICE).map(({ row }) => ({
					companyId,
					customerId: ids.get(row.customer_ref)!,
					address: row.address,
					lat: row.lat,
					lon: row.lon,
					notes: row.notes,
					gateCode: row.gate_code,
					pets: row.pets,
					waterSource: row.water_source,
					flags: flagsOf(row)
				}))
			);
		}
		return { customers: c.customers.length, sites: c.sites.length };
	});
	await tidyAfterBulkLoad();
	return added;
}
