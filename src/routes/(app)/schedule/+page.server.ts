import { fail } from '@sveltejs/kit';
import type { z } from 'zod';
import { fieldErrors, formObject } from '$lib/schemas/form';
import { moveSchema, postponeSchema, scheduleSchema } from '$lib/schemas/job';
import { findConflicts, WORKDAY_HOURS } from '$lib/jobs/conflicts';
import { isIsoDate, localToday, weekDays, weekStart } from '$lib/jobs/week';
import { statusOf } from '$lib/server/api/errors';
import { requireRole } from '$lib/server/auth/guard';
import { DomainError } from '$lib/server/services/errors';
import {
	listCrew,
	listSchedulable,
	listWeek,
	moveJob,
	postponeJob,
	scheduleJob
} from '$lib/server/services/jobs';
import type { MailOutcome } from '$lib/server/services/job-mail';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'owner', 'sales');
	const asked = event.url.searchParams.get('week');
	const today = localToday();
	const monday = weekStart(asked && isIsoDate(asked) ? asked : today);
	const [crew, jobs, schedulable] = await Promise.all([
		listCrew(user.companyId),
		listWeek(user.companyId, monday),
		listSchedulable(user.companyId)
	]);
	const wanted = event.url.searchParams.get('estimate');
	return {
		today,
		monday,
		days: weekDays(monday),
		badWeek: asked !== null && !isIsoDate(asked),
		crew,
		jobs,
		conflicts: findConflicts(jobs, WORKDAY_HOURS),
		dayHours: WORKDAY_HOURS,
		schedulable,
		preselect: schedulable.some((s) => s.id === wanted) ? wanted : null
	};
};

async function readForm(event: RequestEvent) {
	const fd = await event.request.formData();
	return {
		...formObject(fd),
		crewIds: fd.getAll('crewIds').filter((v): v is string => typeof v === 'string')
	};
}

const MAIL_NOTES: Record<MailOutcome, string> = {
	sent: 'The customer has been e-mailed.',
	queued: 'The customer’s e-mail is in the outbox.',
	'already-sent': 'The customer already has this e-mail.',
	'no-address': 'The customer has no e-mail address on file: call them.'
};

type Action = 'schedule' | 'move' | 'postpone';

async function run<S extends z.ZodType>(
	event: RequestEvent,
	action: Action,
	schema: S,
	go: (
		user: ReturnType<typeof requireRole>,
		data: z.output<S>
	) => Promise<{ mail: MailOutcome | string; done: string; jobId?: string }>
) {
	const user = requireRole(event, 'owner', 'sales');
	const values = await readForm(event);
	const parsed = schema.safeParse(values);
	if (!parsed.success) {
		const { crewIds, ...rest } = values;
		return fail(400, {
			action,
			errors: fieldErrors(parsed.error),
			values: { ...rest, crewIds: crewIds.slice(0, 6) }
		});
	}
	try {
		const r = await go(user, parsed.data);
		return {
			action,
			jobId: r.jobId ?? null,
			done: `${r.done} ${MAIL_NOTES[r.mail as MailOutcome] ?? ''}`.trim()
		};
	} catch (e) {
		if (e instanceof DomainError) {
			const errors = Object.fromEntries((e.issues ?? []).map((i) => [i.path, i.message]));
			return fail(statusOf(e), { action, message: e.message, errors });
		}
		throw e;
	}
}

export const actions: Actions = {
	schedule: (event) =>
		run(event, 'schedule', scheduleSchema, async (user, d) => {
			const r = await scheduleJob(user, d);
			return { mail: r.mail, done: 'Scheduled.', jobId: r.jobId };
		}),
	move: (event) =>
		run(event, 'move', moveSchema, async (user, d) => {
			const r = await moveJob(user, d);
			return { mail: r.mail, done: 'Moved.' };
		}),
	postpone: (event) =>
		run(event, 'postpone', postponeSchema, async (user, d) => {
			const r = await postponeJob(user, d);
			return { mail: r.mail, done: d.newDate ? 'Postponed to the new date.' : 'Postponed.' };
		})
};
