import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';

/**
 * Spreadsheet programs run a cell that starts with one of these as a formula (OWASP, "CSV
 * Injection"): = + - @, and tab or carriage return, which some programs skip before looking.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * A text cell as written to a file: one leading apostrophe makes a would-be formula plain text.
 * A value that already starts with apostrophes before such a character gets one more, so
 * `restoreCell` can always take exactly one off and read back what was stored.
 */
export function neutraliseCell(value: string): string {
	return FORMULA_START.test(value.replace(/^'+/, '')) ? `'${value}` : value;
}

/** The inverse of `neutraliseCell`: a cell of apostrophes and then a formula start loses one. */
export function restoreCell(cell: string): string {
	return /^'+[=+\-@\t\r]/.test(cell) ? cell.slice(1) : cell;
}

/** A cell of an exported file: text is neutralised; numbers and empties are written as they are. */
export type Cell = string | number | null | undefined;

function cellText(v: Cell): string {
	if (v === null || v === undefined) return '';
	if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
	return neutraliseCell(v);
}

/**
 * A CSV file (RFC 4180: comma, double quotes, CRLF) with a header row. It starts with a UTF-8
 * byte-order mark, which spreadsheet programs need to read non-ASCII text as UTF-8.
 */
export function toCsv(header: readonly string[], rows: readonly (readonly Cell[])[]): string {
	return stringify([header.map(cellText), ...rows.map((r) => r.map(cellText))], {
		bom: true,
		record_delimiter: 'windows',
		// A lone CR or LF inside a cell is quoted too, so no reader takes it for a row's end.
		quoted_match: /[\r\n]/
	});
}

/** A file that could not be read as CSV at all: `line` is where the reader stopped. */
export class CsvUnreadable extends Error {
	constructor(
		message: string,
		readonly line?: number
	) {
		super(message);
		this.name = 'CsvUnreadable';
	}
}

export interface CsvTable {
	header: string[];
	/** Data rows with their line number in the file (the header is line 1). */
	rows: { line: number; cells: string[] }[];
}

/**
 * Reads a CSV file into a header and data rows, every cell restored (`restoreCell`). A byte-order
 * mark is dropped; rows of a different length than the header are kept for the caller to report.
 */
export function parseCsv(text: string): CsvTable {
	let records: { record: string[]; info: { lines: number } }[];
	try {
		records = parse(text, {
			bom: true,
			relax_column_count: true,
			skip_empty_lines: true,
			info: true
		}) as unknown as { record: string[]; info: { lines: number } }[];
	} catch (e) {
		const line = (e as { lines?: number }).lines;
		throw new CsvUnreadable(
			`The file is not valid CSV${line ? ` (near line ${line})` : ''}: ${(e as Error).message}`,
			line
		);
	}
	if (records.length === 0) throw new CsvUnreadable('The file is empty: it needs a header row.');
	const [head, ...rest] = records;
	return {
		header: head.record.map((h) => h.trim().toLowerCase()),
		rows: rest.map((r) => ({ line: r.info.lines, cells: r.record.map(restoreCell) }))
	};
}
