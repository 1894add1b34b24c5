/**
 * Local stand-ins for the outside services, started by scripts/start.sh and scripts/test.sh:
 *  - the SMTP catcher on 127.0.0.1:$SMTP_PORT, storing every message in PostgreSQL (caught_mail);
 *  - the payment provider fake on 127.0.0.1:$PAYMENTS_API_PORT, posting signed events to
 *    $PAYMENTS_WEBHOOK_URL.
 * `--only smtp` or `--only payments` starts one of them. With SERVICES_CONTROL_PORT set, a small
 * control API on 127.0.0.1 lets tests stop and start each stand-in (an SMTP outage on demand):
 *   GET /status · POST /smtp/stop · POST /smtp/start · POST /payments/stop · POST /payments/start
 */
import { createServer } from 'node:http';
import { config } from '../src/lib/server/config';
import { sequelize } from '../src/lib/server/db';
import { startSmtpCatcher, type SmtpCatcher } from '../src/lib/server/dev-services/smtp-catcher';
import { startPaymentsFake, type PaymentsFake } from '../src/lib/server/dev-services/payments-fake';

if (process.env.TRAYWISE_ENV === 'production') {
	console.error('[services] the local stand-ins are for development and tests, not production.');
	process.exit(1);
}

const args = process.argv.slice(2);
const only = args.includes('--only') ? args[args.indexOf('--only') + 1] : null;
if (only && only !== 'smtp' && only !== 'payments') {
	console.error(`[services] --only takes "smtp" or "payments", not ${JSON.stringify(only)}`);
	process.exit(2);
}
const wantSmtp = only !== 'payments';
const wantPayments = only !== 'smtp';
const log = (name: string) => (message: string) => console.log(`[${name}] ${message}`);

let smtp: SmtpCatcher | null = null;
let payments: PaymentsFake | null = null;

async function startSmtp(): Promise<void> {
	smtp ??= await startSmtpCatcher({ host: '127.0.0.1', port: config.smtp.port, log: log('smtp') });
}
async function stopSmtp(): Promise<void> {
	const running = smtp;
	smtp = null;
	await running?.stop();
}
async function startPayments(): Promise<void> {
	const p = config.payments;
	payments ??= await startPaymentsFake({
		host: '127.0.0.1',
		port: p.port ?? 12111,
		secretKey: p.secretKey,
		webhookSecret: p.webhookSecret,
		webhookUrl: p.webhookUrl,
		log: log('payments')
	});
}
async function stopPayments(): Promise<void> {
	const running = payments;
	payments = null;
	await running?.stop();
}

const control = config.devServices.controlPort
	? createServer((req, res) => {
			const reply = (code: number, body: unknown) => {
				res.writeHead(code, { 'content-type': 'application/json' });
				res.end(JSON.stringify(body));
			};
			const status = () => ({ smtp: smtp ? 'running' : 'stopped', payments: payments ? 'running' : 'stopped' });
			const actions: Record<string, () => Promise<void>> = {
				'POST /smtp/stop': stopSmtp,
				'POST /smtp/start': startSmtp,
				'POST /payments/stop': stopPayments,
				'POST /payments/start': startPayments
			};
			const key = `${req.method} ${req.url}`;
			if (key === 'GET /status') return reply(200, status());
			const action = actions[key];
			if (!action) return reply(404, { message: 'unknown control action' });
			action().then(
				() => reply(200, status()),
				(err: Error) => reply(500, { message: err.message, ...status() })
			);
		})
	: null;

let shuttingDown = false;
async function shutdown(code: number): Promise<void> {
	if (shuttingDown) return;
	shuttingDown = true;
	control?.close();
	await Promise.allSettled([stopSmtp(), stopPayments()]);
	await sequelize.close().catch(() => {});
	process.exit(code);
}
process.on('SIGTERM', () => void shutdown(0));
process.on('SIGINT', () => void shutdown(0));
// started in the background by a script: when that script is gone, so are we (no orphan holding ports)
const parent = process.ppid;
setInterval(() => {
	if (process.ppid !== parent) {
		console.log('[services] the starting process is gone; stopping');
		void shutdown(0);
	}
}, 1_000).unref();

try {
	if (wantSmtp) await startSmtp();
	if (wantPayments) await startPayments();
	if (control) {
		await new Promise<void>((resolve, reject) => {
			control.once('error', reject);
			control.listen(config.devServices.controlPort, '127.0.0.1', () => resolve());
		});
		console.log(`[services] control API on 127.0.0.1:${config.devServices.controlPort}`);
	}
} catch (err) {
	console.error(`[services] could not start: ${(err as Error).message}`);
	await shutdown(1);
}
