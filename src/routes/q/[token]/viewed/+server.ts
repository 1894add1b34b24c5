import { act } from '$lib/server/quotes/workflow';
import { checkLink } from '$lib/server/quotes/customer-view';
import type { RequestHandler } from './$types';

/**
 * The customer's page reports that it was opened (from the browser, after it has shown the quote),
 * so a link checker fetching the e-mail's link does not count as a view. Marks "viewed" once.
 */
export const POST: RequestHandler = async ({ params }) => {
	const link = await checkLink(params.token);
	await act(link.quoteId, { user: null, role: 'customer' }, 'view', { revisionId: link.revisionId });
	return new Response(null, { status: 204 });
};
