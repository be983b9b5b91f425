// Formula neutralisation and the CSV round trip. The dangerous first characters (= + - @, tab,
// carriage return) and the leading-apostrophe remedy are from OWASP's "CSV Injection" page
// (https://owasp.org/www-community/attacks/CSV_Injection). Quoting follows RFC 4180 §2
// (fields with commas, quotes or line breaks are enclosed in double quotes, a quote doubled).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	neutraliseCell,
	parseCsv,
	restoreCell,
	toCsv,
	CsvUnreadable
} from '../../../src/lib/csv/cells';

describe('neutraliseCell', () => {
	it.each([
		['=HYPERLINK("http://x.example","y")', `'=HYPERLINK("http://x.example","y")`],
		['+1 555 0100', "'+1 555 0100"],
		["-2+3+cmd|' /C calc'!A0", "'-2+3+cmd|' /C calc'!A0"],
		['@SUM(A1:A2)', "'@SUM(A1:A2)"],
		['\t=1+1', "'\t=1+1"],
		['\r=1+1', "'\r=1+1"]
	])('writes %j as text: %j (OWASP list)', (value, written) => {
		expect(neutraliseCell(value)).toBe(written);
	});

	it('leaves ordinary text alone', () => {
		for (const v of ['Maren Holloway', '18 Ropewalk Lane', "O'Brien", "'quoted'", '', '1=1'])
			expect(neutraliseCell(v)).toBe(v);
	});

	it('adds one more apostrophe to a value that already starts with apostrophes and a formula', () => {
		// Otherwise "'=x" (stored) and "=x" (stored) would both be written "'=x".
		expect(neutraliseCell("'=x")).toBe("''=x");
		expect(restoreCell("''=x")).toBe("'=x");
	});

	it('restoreCell undoes neutraliseCell for any text (property)', () => {
		fc.assert(
			fc.property(fc.string({ unit: 'grapheme', maxLength: 30 }), (v) => {
				expect(restoreCell(neutraliseCell(v))).toBe(v);
			}),
			{ numRuns: 2000 }
		);
		fc.assert(
			fc.property(
				fc.constantFrom("'", '=', '+', '-', '@', '\t', '\r', 'a', ' '),
				fc.array(fc.constantFrom("'", '=', '+', '-', '@', '\t', '\r', 'a', ' '), { maxLength: 6 }),
				(a, rest) => {
					const v = [a, ...rest].join('');
					expect(restoreCell(neutraliseCell(v))).toBe(v);
					// What a spreadsheet sees never starts with a formula character.
					expect(/^[=+\-@\t\r]/.test(neutraliseCell(v))).toBe(false);
				}
			),
			{ numRuns: 2000 }
		);
	});
});

describe('toCsv and parseCsv', () => {
	it('quotes per RFC 4180 and starts with a UTF-8 byte-order mark', () => {
		const csv = toCsv(
			['a', 'b'],
			[
				['x,y', 'say "hi"'],
				['line\nbreak', 3.5]
			]
		);
		expect(csv).toBe('\uFEFFa,b\r\n"x,y","say ""hi"""\r\n"line\nbreak",3.5\r\n');
	});

	it('writes numbers as numbers, not neutralised: a negative longitude stays a number', () => {
		expect(toCsv(['lon'], [[-74.4512]])).toBe('\uFEFFlon\r\n-74.4512\r\n');
		expect(toCsv(['lon'], [['-74.4512']])).toBe("\uFEFFlon\r\n'-74.4512\r\n");
	});

	it('reads back exactly what it wrote, formulas, quotes, line breaks and all (property)', () => {
		fc.assert(
			fc.property(
				fc.array(
					fc.tuple(fc.string({ minLength: 1, maxLength: 20 }), fc.string({ maxLength: 20 })),
					{
						minLength: 1,
						maxLength: 10
					}
				),
				(rows) => {
					const t = parseCsv(toCsv(['name', 'notes'], rows));
					expect(t.header).toEqual(['name', 'notes']);
					expect(t.rows.map((r) => r.cells)).toEqual(rows);
				}
			),
			{ numRuns: 500 }
		);
	});

	it('numbers rows by their line in the file', () => {
		const t = parseCsv('name\r\nA\r\n"B\nC"\r\nD\r\n');
		expect(t.rows.map((r) => [r.line, r.cells[0]])).toEqual([
			[2, 'A'],
			[4, 'B\nC'],
			[5, 'D']
		]);
	});

	it('refuses an unclosed quote and an empty file with a reason', () => {
		expect(() => parseCsv('a,b\r\n"open,1\r\n')).toThrow(CsvUnreadable);
		expect(() => parseCsv('')).toThrow(/empty/);
	});
});
