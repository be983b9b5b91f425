import { navFor } from '$lib/roles';
import { requireUser } from '$lib/server/auth/guard';
import { env } from '$lib/server/env';
import { getCompany } from '$lib/server/services/company';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	const user = requireUser(event);
	const company = await getCompany(user.companyId);
	return {
		user: { name: user.name, email: user.email, role: user.role },
		company: { name: company?.name ?? 'Your company' },
		// The Outbox shows the local mail fake: a demo-mode page only.
		nav: navFor(user.role).filter((n) => n.href !== '/outbox' || env.mailFakeInboxUrl !== null)
	};
};
