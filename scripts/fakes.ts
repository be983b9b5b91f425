// Starts the local SMTP fake and the local payments fake on fixed ports of 127.0.0.1 and prints
// their addresses: `npx tsx scripts/fakes.ts`. `npm run demo` starts them for you (scripts/demo.ts).
import { startFakes } from '../src/lib/server/fakes/start';

const fakes = await startFakes();
for (const line of fakes.describe()) console.log(line);
const stop = async () => {
	await fakes.close();
	process.exit(0);
};
process.once('SIGINT', stop);
process.once('SIGTERM', stop);
