// `npm run demo`, last step: starts the local mail and payment fakes (unless real settings are
// in the environment), then the built server pointed at them; Ctrl-C or SIGTERM stops all.
import { spawn } from 'node:child_process';
import { startFakes } from '../src/lib/server/fakes/start';

process.env.PORT ??= '3000';
process.env.ORIGIN ??= `http://localhost:${process.env.PORT}`;

const fakes = await startFakes();
for (const line of fakes.describe()) console.log(line);

const server = spawn(process.execPath, ['scripts/start.js'], {
	env: { ...process.env, ...fakes.appEnv },
	stdio: 'inherit'
});

let stopping = false;
const stop = (signal: NodeJS.Signals) => {
	if (stopping) return;
	stopping = true;
	if (server.exitCode === null) server.kill(signal);
	setTimeout(() => server.kill('SIGKILL'), 10_000).unref();
};
process.on('SIGINT', () => stop('SIGTERM'));
process.on('SIGTERM', () => stop('SIGTERM'));
server.on('exit', async (code, signal) => {
	await fakes.close();
	process.exit(code ?? (signal ? 0 : 1));
});
