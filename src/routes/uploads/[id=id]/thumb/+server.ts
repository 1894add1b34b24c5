import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { findUpload } from '$lib/server/repositories/uploads';
import { uploadResponse } from '$lib/server/uploads';
import type { RequestHandler } from './$types';

/** The WebP thumbnail of an image upload, to signed-in staff only; 404 for PDFs and undecodable images. */
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'upload:read');
	const record = await findUpload(event.params.id);
	const response = record && (await uploadResponse(record, 'thumb', event.request.headers.get('if-none-match')));
	if (!response) error(404, 'This file has no thumbnail.');
	return response;
};
