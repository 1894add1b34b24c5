import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { findUpload } from '$lib/server/repositories/uploads';
import { uploadResponse } from '$lib/server/uploads';
import type { RequestHandler } from './$types';

/** A stored upload, to signed-in staff only. */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'upload:read');
	const record = await findUpload(event.params.id);
	const response = record && (await uploadResponse(record, 'original', event.request.headers.get('if-none-match')));
	if (!response) error(404, 'There is no such file.');
	return response;
};
