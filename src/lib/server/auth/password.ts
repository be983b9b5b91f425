import { hash, verify } from '@node-rs/argon2';

/** OWASP Password Storage Cheat Sheet minimum for argon2id: m = 19 MiB, t = 2, p = 1. */
const PARAMS = { memoryCost: 19_456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
	return hash(password, PARAMS);
}

export async function verifyPassword(phc: string, password: string): Promise<boolean> {
	try {
		return await verify(phc, password);
	} catch {
		return false;
	}
}

/** A fixed hash to verify against when the user is unknown, so both paths cost the same. */
let dummy: Promise<string> | undefined;
export function dummyHash(): Promise<string> {
	dummy ??= hashPassword('clearpitch-no-such-user');
	return dummy;
}
