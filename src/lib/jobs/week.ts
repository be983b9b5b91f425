/**
 * Calendar arithmetic for the week view, on plain `YYYY-MM-DD` dates (no time zone: a job's
 * date is the contractor's local calendar day). Weeks start on Monday (ISO 8601).
 */

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** True for a real calendar date written `YYYY-MM-DD`. */
export function isIsoDate(s: string): boolean {
	const m = ISO_DATE.exec(s);
	if (!m) return false;
	const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
	return d.toISOString().slice(0, 10) === s;
}

function toUtc(s: string): Date {
	if (!isIsoDate(s)) throw new Error(`Not a date: ${s}`);
	return new Date(`${s}T00:00:00Z`);
}

export function addDays(s: string, n: number): string {
	const d = toUtc(s);
	d.setUTCDate(d.getUTCDate() + n);
	return d.toISOString().slice(0, 10);
}

/** The Monday on or before `s`. */
export function weekStart(s: string): string {
	const dow = toUtc(s).getUTCDay(); // 0 = Sunday
	return addDays(s, -((dow + 6) % 7));
}

export function weekDays(monday: string): string[] {
	return Array.from({ length: 7 }, (_, i) => addDays(monday, i));
}

/** Today's date where the server or browser runs, as `YYYY-MM-DD` in its local time. */
export function localToday(now = new Date()): string {
	const p = (n: number) => String(n).padStart(2, '0');
	return `${now.getFullYear()}-${p(now.getMonth() + 1)}-${p(now.getDate())}`;
}

const HM = /^([01]\d|2[0-3]):([0-5]\d)$/;

export function isHm(s: string): boolean {
	return HM.test(s);
}

/** Minutes after midnight of a `HH:MM` time. */
export function minutesOf(hm: string): number {
	const m = HM.exec(hm);
	if (!m) throw new Error(`Not a time: ${hm}`);
	return Number(m[1]) * 60 + Number(m[2]);
}

const DAY_NAMES = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const LONG_DAYS = ['Sunday', 'Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday'];
const LONG_MONTHS = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
];

/** "Thu 3 Dec". */
export function shortDay(s: string): string {
	const d = toUtc(s);
	return `${DAY_NAMES[d.getUTCDay()]} ${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}`;
}

/** "Thursday, December 3, 2026". */
export function longDay(s: string): string {
	const d = toUtc(s);
	return `${LONG_DAYS[d.getUTCDay()]}, ${LONG_MONTHS[d.getUTCMonth()]} ${d.getUTCDate()}, ${d.getUTCFullYear()}`;
}
