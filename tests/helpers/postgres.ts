import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { freePort } from './server';

export type TempPostgres = { url: string; stop: () => void };

function pgBin(): string {
	const base = '/usr/lib/postgresql';
	const versions = fs.existsSync(base) ? fs.readdirSync(base).sort().reverse() : [];
	for (const v of versions) {
		const bin = path.join(base, v, 'bin');
		if (fs.existsSync(path.join(bin, 'initdb'))) return bin;
	}
	throw new Error('PostgreSQL server binaries not found: install the Debian package "postgresql".');
}

/** initdb refuses to run as root, so as root the cluster belongs to the postgres user. */
function asPg(cmd: string, args: string[]) {
	const root = process.getuid?.() === 0;
	const [file, argv] = root ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args];
	const r = spawnSync(file, argv, { encoding: 'utf8' });
	if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr || r.stdout}`);
	return r.stdout;
}

/** A throwaway PostgreSQL cluster on loopback, for the dual-driver tests. */
export async function startPostgres(): Promise<TempPostgres> {
	const bin = pgBin();
	const dir = fs.mkdtempSync('/tmp/clearpitch-pg-');
	if (process.getuid?.() === 0) execFileSync('chown', ['postgres:postgres', dir]);
	const data = path.join(dir, 'data');
	const port = await freePort();
	asPg(path.join(bin, 'initdb'), ['-D', data, '-A', 'trust', '-U', 'postgres', '--no-sync']);
	asPg(path.join(bin, 'pg_ctl'), [
		'-D',
		data,
		'-l',
		path.join(dir, 'log'),
		'-o',
		`-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off`,
		'-w',
		'start'
	]);
	return {
		url: `postgres://postgres@127.0.0.1:${port}/postgres`,
		stop: () => {
			asPg(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'fast', '-w', 'stop']);
			fs.rmSync(dir, { recursive: true, force: true });
		}
	};
}
