/**
 * Stops and starts the private PostgreSQL cluster that scripts/test.sh runs, so a test can take the
 * database away under the running app. test.sh exports where the cluster lives:
 * TEST_PG_BIN (Debian's binaries), TEST_PG_DATA, TEST_PG_SOCKET, TEST_PG_PORT and TEST_PG_RUN_AS
 * (`postgres` when the suite runs as root: the server refuses to run as root).
 */
import { execFile } from 'node:child_process';
import { readFile, readdir } from 'node:fs/promises';
import path from 'node:path';

const BIN = process.env.TEST_PG_BIN ?? '';
const DATA = process.env.TEST_PG_DATA ?? '';
const SOCKET = process.env.TEST_PG_SOCKET ?? '';
const PORT = process.env.TEST_PG_PORT ?? '';
const RUN_AS = process.env.TEST_PG_RUN_AS ?? '';

/** Why the cluster cannot be controlled from here, or null when it can. */
export function postgresControlProblem(): string | null {
	const missing = Object.entries({
		TEST_PG_BIN: BIN,
		TEST_PG_DATA: DATA,
		TEST_PG_SOCKET: SOCKET,
		TEST_PG_PORT: PORT
	})
		.filter(([, v]) => !v)
		.map(([k]) => k);
	return missing.length ? `run through scripts/test.sh (missing ${missing.join(', ')})` : null;
}

function run(
	program: string,
	args: string[],
	timeoutMs: number
): Promise<{ code: number; output: string }> {
	const exe = path.join(BIN, program);
	const [cmd, argv] = RUN_AS ? ['runuser', ['-u', RUN_AS, '--', exe, ...args]] : [exe, args];
	return new Promise((resolve) => {
		// cwd "/": the postgres user may not be allowed into the project folder
		execFile(cmd, argv, { cwd: '/', timeout: timeoutMs }, (err, stdout, stderr) => {
			const code = err
				? typeof (err as { code?: unknown }).code === 'number'
					? (err as { code: number }).code
					: 1
				: 0;
			resolve({ code, output: `${stdout}${stderr}`.trim() });
		});
	});
}

export const postgres = {
	/** True when the server accepts connections. */
	async isReady(): Promise<boolean> {
		return (await run('pg_isready', ['-h', SOCKET, '-p', PORT, '-q'], 5_000)).code === 0;
	},
	/**
	 * Stops the server. `fast` (the default) ends every session and rolls its transaction back, but
	 * in whatever order the backends see the signal: a session waiting on another's row lock can be
	 * let through and commit in the moment between the two. `immediate` stops every process at once,
	 * as a crash or a pulled plug does (nothing commits after it; the next start recovers from WAL).
	 */
	async stop(mode: 'fast' | 'immediate' = 'fast'): Promise<void> {
		const { code, output } = await run(
			'pg_ctl',
			['-D', DATA, '-m', mode, '-w', '-t', '30', 'stop'],
			40_000
		);
		if (code !== 0) throw new Error(`pg_ctl stop failed (${code}): ${output}`);
	},
	async start(): Promise<void> {
		const { code, output } = await run(
			'pg_ctl',
			['-D', DATA, '-l', path.join(DATA, 'server.log'), '-w', '-t', '30', 'start'],
			40_000
		);
		if (code !== 0 && !(await this.isReady()))
			throw new Error(`pg_ctl start failed (${code}): ${output}`);
		const deadline = Date.now() + 15_000;
		while (!(await this.isReady())) {
			if (Date.now() > deadline)
				throw new Error('PostgreSQL started but does not accept connections');
			await new Promise((r) => setTimeout(r, 200));
		}
	},
	/**
	 * Freezes every process of the cluster (SIGSTOP): connections stay open but nothing answers, as
	 * with a hung server or a network that drops packets. `thaw` (SIGCONT) lets it carry on.
	 */
	async freeze(): Promise<void> {
		for (const pid of await clusterPids()) process.kill(pid, 'SIGSTOP');
		frozen = true;
	},
	async thaw(): Promise<void> {
		for (const pid of await clusterPids()) process.kill(pid, 'SIGCONT');
		frozen = false;
	},
	/** Thaws a frozen cluster and starts a stopped one (cleanup after a failed test). */
	async ensureRunning(): Promise<void> {
		if (frozen) await this.thaw();
		if (!(await this.isReady())) await this.start();
	}
};

let frozen = false;

/** The postmaster (first line of postmaster.pid) and its children. */
async function clusterPids(): Promise<number[]> {
	const postmaster = Number(
		(await readFile(path.join(DATA, 'postmaster.pid'), 'utf8')).split('\n')[0]
	);
	if (!Number.isInteger(postmaster) || postmaster <= 1)
		throw new Error('no postmaster.pid: is PostgreSQL running?');
	const children: number[] = [];
	for (const entry of await readdir('/proc')) {
		if (!/^\d+$/.test(entry)) continue;
		try {
			const stat = await readFile(`/proc/${entry}/stat`, 'utf8');
			// "pid (name) state ppid ...": the name may hold spaces, so read after the last ")"
			const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
			if (ppid === postmaster) children.push(Number(entry));
		} catch {
			// the process ended meanwhile
		}
	}
	return [postmaster, ...children];
}
