import { fail } from '@sveltejs/kit';
import { MAX_IMPORT_CHARS } from '$lib/schemas/csv-import';
import { requireRole } from '$lib/server/auth/guard';
import { importCsv, previewImport, type ImportProblem } from '$lib/server/services/csv-import';
import { Invalid } from '$lib/server/services/errors';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'owner');
	return {};
};

type Files = { customers: string; sites: string };

/**
 * The two files as text, from a chosen file (multipart) or from the preview's hidden fields;
 * a file too large is a problem of its own rather than something to read into memory.
 */
async function filesOf(data: FormData): Promise<{ files: Files; problems: ImportProblem[] }> {
	const files: Files = { customers: '', sites: '' };
	const problems: ImportProblem[] = [];
	for (const name of ['customers', 'sites'] as const) {
		const v = data.get(name);
		const tooLarge =
			typeof v === 'string' ? v.length > MAX_IMPORT_CHARS : !!v && v.size > MAX_IMPORT_CHARS;
		if (tooLarge) {
			problems.push({
				file: name,
				line: 0,
				column: '',
				message: `The ${name} file is too large (max 2 MB); import it in parts.`
			});
		} else if (typeof v === 'string') files[name] = v;
		else if (v) files[name] = await v.text();
	}
	return { files, problems };
}

async function read(event: Parameters<Actions[string]>[0]) {
	try {
		return await event.request.formData();
	} catch {
		return null;
	}
}

export const actions: Actions = {
	preview: async (event) => {
		const user = requireRole(event, 'owner');
		const data = await read(event);
		if (!data) return fail(400, { message: 'Send the files as a form.' });
		const { files, problems } = await filesOf(data);
		if (problems.length) return fail(400, { problems });
		const preview = await previewImport(user.companyId, files);
		if (preview.problems.length) return fail(400, { preview, problems: preview.problems });
		return { preview };
	},
	import: async (event) => {
		const user = requireRole(event, 'owner');
		const data = await read(event);
		if (!data) return fail(400, { message: 'Send the files as a form.' });
		const { files, problems } = await filesOf(data);
		if (problems.length) return fail(400, { problems });
		try {
			const n = await importCsv(user.companyId, files);
			return {
				imported: n,
				done: `Imported ${n.customers} customer${n.customers === 1 ? '' : 's'} and ${n.sites} site${n.sites === 1 ? '' : 's'}.`
			};
		} catch (e) {
			if (!(e instanceof Invalid)) throw e;
			const problems = (e.issues ?? []).map((i) => {
				const [file, line, ...column] = i.path.split(':');
				return { file, line: Number(line), column: column.join(':'), message: i.message };
			});
			return fail(400, { message: e.message, problems });
		}
	}
};
