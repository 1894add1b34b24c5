import { openLink } from '$lib/server/quotes/customer-view';
import { getCompanySettings } from '$lib/server/repositories/pricing';
import type { PageServerLoad } from './$types';

/** Where the payment page sends the customer back; the provider's signed webhook is what marks the deposit paid. */
export const load: PageServerLoad = async ({ params, setHeaders }) => {
	const { quote } = await openLink(params.token);
	setHeaders({ 'cache-control': 'private, no-store' });
	const settings = await getCompanySettings();
	return {
		number: quote.revision.number,
		state: quote.revision.state,
		depositCents: quote.revision.totals.depositCents,
		currency: settings.currency ?? 'USD',
		dealerName: settings.dealerName,
		repName: quote.ownerName,
		repEmail: quote.ownerEmail
	};
};
