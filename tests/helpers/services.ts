/**
 * Control of the local stand-ins that scripts/test.sh starts (scripts/services.ts with
 * SERVICES_CONTROL_PORT), so a test can take the SMTP catcher down and bring it back.
 */
const CONTROL = `http://127.0.0.1:${process.env.SERVICES_CONTROL_PORT ?? '2527'}`;

async function control(action: string): Promise<{ smtp: string; payments: string }> {
	const res = await fetch(`${CONTROL}${action}`, { method: action === '/status' ? 'GET' : 'POST' });
	if (!res.ok) throw new Error(`services control ${action} answered ${res.status}: ${await res.text()}`);
	return res.json();
}

export const services = {
	status: () => control('/status'),
	stopSmtp: () => control('/smtp/stop'),
	startSmtp: () => control('/smtp/start'),
	stopPayments: () => control('/payments/stop'),
	startPayments: () => control('/payments/start')
};

/** Polls `check` until it returns a truthy value (returned) or the time is up (throws with `what`). */
export async function waitFor<T>(what: string, check: () => Promise<T>, timeoutMs = 15_000, intervalMs = 100): Promise<NonNullable<T>> {
	const deadline = Date.now() + timeoutMs;
	let last: unknown;
	while (Date.now() < deadline) {
		try {
			const value = await check();
			if (value) return value as NonNullable<T>;
		} catch (err) {
			last = err;
		}
		await new Promise((r) => setTimeout(r, intervalMs));
	}
	throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}${last ? ` (last error: ${(last as Error).message})` : ''}`);
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
