import Stripe from 'stripe';
import { config } from '../config';

let client: Stripe | null = null;

/**
 * The one client of the payment provider's official SDK, built on first use from PAYMENTS_*
 * settings. With PAYMENTS_API_HOST/PORT/PROTOCOL set it talks to the local fake
 * (scripts/services.ts); left empty, to the provider itself. A change of `.env`, not of code.
 */
export function paymentsClient(): Stripe {
	if (client) return client;
	const p = config.payments;
	client = new Stripe(p.secretKey, {
		...(p.host ? { host: p.host } : {}),
		...(p.port ? { port: p.port } : {}),
		protocol: p.protocol,
		maxNetworkRetries: 2,
		timeout: 20_000,
		appInfo: { name: 'Traywise' }
	});
	return client;
}

/** The signing secret the provider's webhooks are verified with. */
export function webhookSecret(): string {
	return config.payments.webhookSecret;
}
