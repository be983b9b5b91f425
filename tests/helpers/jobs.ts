// Setting up jobs over HTTP for integration and browser tests: an accepted estimate through the
// API (as the owner's token), a schedule through the Schedule page's form action, the crew's
// ids from the team API. Anything unexpected throws with the server's answer.
import { sceneRequest } from '../integration/api-helpers';

async function api<T>(base: string, token: string, method: string, path: string, body?: unknown) {
	const res = await fetch(base + path, {
		method,
		headers: {
			authorization: `Bearer ${token}`,
			accept: 'application/json',
			...(body === undefined ? {} : { 'content-type': 'application/json' })
		},
		body: body === undefined ? undefined : JSON.stringify(body)
	});
	const text = await res.text();
	if (!res.ok) throw new Error(`${method} ${path}: ${res.status} ${text}`);
	return JSON.parse(text) as T;
}

/** A saved estimate of a scene house, moved draft → ready → sent → accepted. */
export async function acceptedEstimate(
	base: string,
	ownerToken: string,
	site: { id: string; houseId: string | null }
): Promise<string> {
	const made = await api<{ estimate: { id: string } }>(base, ownerToken, 'POST', '/api/estimates', {
		...sceneRequest(site.houseId!),
		siteId: site.id,
		save: true
	});
	const id = made.estimate.id;
	for (const status of ['ready', 'sent', 'accepted']) {
		await api(base, ownerToken, 'PATCH', `/api/estimates/${id}`, { status });
	}
	return id;
}

export async function crewIds(base: string, ownerToken: string): Promise<Record<string, string>> {
	const team = await api<{
		members: { id: string; email: string; role: string; active: boolean }[];
	}>(base, ownerToken, 'GET', '/api/team');
	return Object.fromEntries(
		team.members.filter((m) => m.role === 'crew' && m.active).map((m) => [m.email, m.id])
	);
}

export type ActionReply = { status: number; type: string; data: string; location?: string };

/**
 * Posts a form action the way `use:enhance` does and answers kit's JSON reply: `data` is the
 * action's result, serialized (ids and messages appear in it as plain strings).
 */
export async function postAction(
	base: string,
	cookie: string,
	path: string,
	fields: Record<string, string | string[]>
): Promise<ActionReply> {
	const body = new URLSearchParams();
	for (const [k, v] of Object.entries(fields)) {
		for (const one of Array.isArray(v) ? v : [v]) body.append(k, one);
	}
	const res = await fetch(base + path, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			cookie,
			origin: base,
			accept: 'application/json',
			'x-sveltekit-action': 'true',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body
	});
	const json = (await res.json()) as {
		type: string;
		status?: number;
		data?: string;
		location?: string;
	};
	return {
		status: json.status ?? res.status,
		type: json.type,
		data: json.data ?? '',
		location: json.location
	};
}

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/i;

/** Schedules an accepted estimate through the Schedule page; answers the new job's id. */
export async function scheduleViaForm(
	base: string,
	cookie: string,
	f: {
		estimateId: string;
		date: string;
		windowStart?: string;
		windowEnd?: string;
		crewIds: string[];
	}
): Promise<string> {
	const r = await postAction(base, cookie, '/schedule?/schedule', {
		estimateId: f.estimateId,
		date: f.date,
		windowStart: f.windowStart ?? '08:00',
		windowEnd: f.windowEnd ?? '10:00',
		crewIds: f.crewIds
	});
	if (r.type !== 'success') throw new Error(`schedule: ${r.status} ${r.data}`);
	const id = r.data.match(UUID)?.[0];
	if (!id) throw new Error(`schedule: no job id in ${r.data}`);
	return id;
}

export async function getJob<T = JobReply>(base: string, token: string, id: string): Promise<T> {
	return api<T>(base, token, 'GET', `/api/jobs/${id}`);
}

export type JobReply = {
	id: string;
	status: string;
	date: string | null;
	revision: number;
	crewIds: string[];
	history: { kind: string; date: string | null; reason?: string; from?: { date: string | null } }[];
	log: null | {
		checklist: Record<string, boolean>;
		stockGalUsed: number | null;
		surfactantOzUsed: number | null;
		measuredStockPct: number | null;
		notes: string;
		doneReason: string | null;
	};
};
