import { fail } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { listCaughtMail } from '$lib/server/repositories/caught-mail';
import { outboxOverview, requeueFailedMail } from '$lib/server/repositories/mail-outbox';
import { nudgeMailWorker } from '$lib/server/email/outbox';
import { isUuid } from '$lib/server/uuid';
import type { Actions, PageServerLoad } from './$types';

const PAGE_SIZE = 50;

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'admin:mail');
	const requested = Number(event.url.searchParams.get('page') ?? '1');
	const page = Number.isSafeInteger(requested) && requested >= 1 ? requested : 1;
	const [caught, outbox] = await Promise.all([listCaughtMail(page, PAGE_SIZE), outboxOverview(20)]);
	return {
		caught: caught.rows,
		page,
		pages: Math.max(1, Math.ceil(caught.total / PAGE_SIZE)),
		total: caught.total,
		outbox
	};
};

export const actions: Actions = {
	requeue: async (event) => {
		requirePermission(event, 'admin:mail');
		const id = (await event.request.formData()).get('id');
		if (!isUuid(id)) return fail(400, { requeueError: 'Choose a message from the list.' });
		if (!(await requeueFailedMail(id))) {
			return fail(409, { requeueError: 'That message is no longer failed; it may have been sent again already.' });
		}
		nudgeMailWorker();
		return { requeued: id };
	}
};
