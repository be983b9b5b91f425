// Replaces the database and the uploaded files with a backup's: npm run restore -- <file.tar.gz>
// The server must be stopped; the archive is checked whole before anything is replaced.
import path from 'node:path';
import { restoreFrom, RestoreRefused } from '../src/lib/server/backup';
import { DataDirLockedError } from '../src/lib/server/db/lock';

const archive = process.argv[2];
if (!archive) {
	console.error('usage: npm run restore -- <backup archive>');
	process.exit(2);
}
try {
	const { manifest, setAside } = await restoreFrom(path.resolve(archive));
	console.log(
		`Restored the backup of ${manifest.createdAt}: ${Object.keys(manifest.tables).length} tables, ` +
			`${manifest.files.length} files, counts checked.`
	);
	for (const p of setAside)
		console.log(`The data it replaced is kept at ${p}; remove it when satisfied.`);
} catch (e) {
	if (e instanceof DataDirLockedError || e instanceof RestoreRefused) {
		console.error(`Restore refused, nothing was changed: ${e.message}`);
		process.exitCode = 1;
	} else throw e;
}
