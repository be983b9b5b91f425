// Services throw domain errors; api/errors.ts is the one place they become HTTP answers. The
// statuses are the ones RFC 9110 §15.5 gives these meanings: 400 Bad Request, 403 Forbidden,
// 404 Not Found, 409 Conflict.
import { describe, expect, it } from 'vitest';
import { answer, statusOf } from '../../../src/lib/server/api/errors';
import {
	Conflict,
	Forbidden,
	Invalid,
	issuesSummary,
	NotFound
} from '../../../src/lib/server/services/errors';

describe('domain errors to HTTP', () => {
	it.each([
		[new Invalid('bad', [{ path: 'siteId', message: 'siteId must be a UUID' }]), 400],
		[new Forbidden('not your role'), 403],
		[new NotFound('no such estimate'), 404],
		[new Conflict('moved meanwhile'), 409]
	])('%s answers %i with its message and issues', async (e, status) => {
		expect(statusOf(e)).toBe(status);
		const res = await answer(() => {
			throw e;
		});
		expect(res.status).toBe(status);
		expect(await res.json()).toEqual({
			message: e.message,
			...(e.issues ? { issues: e.issues } : {})
		});
	});

	it('lets anything that is not a domain error through', async () => {
		await expect(
			answer(() => {
				throw new TypeError('a bug');
			})
		).rejects.toThrow('a bug');
	});

	it('names the bad fields in an Invalid message, the first five and a count', () => {
		const issues = ['a', 'b', 'c', 'd', 'e', 'f', 'g'].map((p) => ({ path: p, message: 'x' }));
		expect(Invalid.of(issues).message).toBe(
			'The request has 7 problems: a, b, c, d, e and 2 more.'
		);
		expect(issuesSummary([{ path: '', message: 'empty' }], 'roof plan')).toBe(
			'The roof plan has a problem: body.'
		);
	});
});
