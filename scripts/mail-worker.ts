/**
 * The mail outbox worker as its own process, for the scale-out shape: app processes run with
 * MAIL_WORKER_IN_APP=false and one or more of these deliver the mail. Safe to run several (rows are
 * claimed with FOR UPDATE SKIP LOCKED). SIGTERM finishes the pass in progress, then exits.
 */
import { sequelize } from '../src/lib/server/db';
import { closeMailTransport } from '../src/lib/server/email/transport';
import { startMailWorker } from '../src/lib/server/email/worker';
import { config } from '../src/lib/server/config';

const worker = startMailWorker();
console.log(
	`[mail] worker started: SMTP ${config.smtp.host}:${config.smtp.port}, polling every ${config.mail.pollMs} ms`
);

let stopping = false;
async function stop(): Promise<void> {
	if (stopping) return;
	stopping = true;
	console.log('[mail] stopping after the current pass');
	await worker.stop();
	closeMailTransport();
	await sequelize.close().catch(() => {});
	process.exit(0);
}
process.on('SIGTERM', () => void stop());
process.on('SIGINT', () => void stop());
