// Writes the database and the uploaded files into one archive: npm run backup -- [file.tar.gz]
import path from 'node:path';
import { archiveName, backupTo } from '../src/lib/server/backup';
import { closeDb } from '../src/lib/server/db';
import { DataDirLockedError } from '../src/lib/server/db/lock';

const out = path.resolve(process.argv[2] || path.join('backups', archiveName()));
try {
	const m = await backupTo(out);
	const rows = Object.values(m.tables).reduce((a, b) => a + b, 0);
	console.log(
		`Backup written to ${out}: ${m.database.kind} database, ${Object.keys(m.tables).length} tables, ` +
			`${rows} rows, ${m.files.length} files${m.filesStore === 's3' ? ' (files stay in the bucket)' : ''}.`
	);
} catch (e) {
	if (e instanceof DataDirLockedError) {
		console.error(
			`${e.message}\nWhile the server runs, use the Backup button on Settings instead.`
		);
		process.exitCode = 1;
	} else throw e;
} finally {
	await closeDb();
}
