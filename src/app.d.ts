import type { Role } from '$lib/roles';
import type { LocalUser } from '$lib/server/auth/session';

declare global {
	namespace App {
		type Role = import('$lib/roles').Role;
		interface Locals {
			user: LocalUser | null;
			sessionId: string | null;
		}
		interface Error {
			message: string;
			errorId?: string;
			issues?: { path: string; message: string }[];
		}
	}
}

export type { Role };
