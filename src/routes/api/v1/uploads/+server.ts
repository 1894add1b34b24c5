import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { uploadRequestSchema } from '$lib/schemas/upload';
import { requirePermission, requireUser } from '$lib/server/auth/guard';
import type { Permission } from '$lib/server/auth/permissions';
import { customerExists } from '$lib/server/repositories/customers';
import { getSurvey } from '$lib/server/repositories/surveys';
import { storeUpload } from '$lib/server/uploads';
import { MAX_FILES_PER_REQUEST, MAX_UPLOAD_TEXT, type OwnerType, type UploadResult } from '$lib/uploads';
import type { RequestHandler } from './$types';

/** SvelteKit's 413 for a body over BODY_SIZE_LIMIT, as the body reader passes it on. */
function tooLarge(err: unknown): boolean {
	const status = (e: unknown) => (e && typeof e === 'object' ? (e as { status?: unknown }).status : undefined);
	return status(err) === 413 || status((err as { cause?: unknown } | null)?.cause) === 413;
}

/** Who may attach files to each kind of owner. */
const ATTACH: Record<OwnerType, Permission> = {
	customer: 'customer:manage',
	survey: 'survey:edit',
	company: 'admin:settings'
};

/**
 * Multipart: `ownerType`, `ownerId`, `kind` and one or more `files` (`files[]` also accepted).
 * Answers `{ results: [{ ok, name, upload | message }], stored, refused }`: 200 when at least one
 * file was stored, 400 when none was. Ownership beyond "the customer exists" is checked by the
 * owning module (surveys check their owner there).
 */
export const POST: RequestHandler = async (event) => {
	const user = requireUser(event);
	let form: FormData;
	try {
		form = await event.request.formData();
	} catch (err) {
		if (tooLarge(err)) {
			// BODY_SIZE_LIMIT refused the request before any file could be read
			const message = `The upload is larger than the server takes in one request. Send fewer files at a time (each at most ${MAX_UPLOAD_TEXT}).`;
			return json({ message, errors: { files: [message] } }, { status: 413 });
		}
		return json(
			{ message: 'Send the files as multipart/form-data with ownerType, ownerId, kind and files.' },
			{ status: 400 }
		);
	}
	const parsed = uploadRequestSchema.safeParse({
		ownerType: form.get('ownerType') ?? undefined,
		ownerId: form.get('ownerId') ?? undefined,
		kind: form.get('kind') ?? undefined
	});
	if (!parsed.success) {
		return json({ message: 'Check the fields marked.', errors: z.flattenError(parsed.error).fieldErrors }, { status: 400 });
	}
	const { ownerType, ownerId, kind } = parsed.data;
	requirePermission(event, ATTACH[ownerType]);
	if (ownerType === 'customer' && !(await customerExists(ownerId))) {
		return json({ message: 'There is no such customer.', errors: { ownerId: ['There is no such customer.'] } }, { status: 404 });
	}

	if (ownerType === 'survey') {
		const survey = await getSurvey(ownerId, user);
		if (!survey.ok) {
			const message = survey.status === 404 ? 'There is no such survey.' : 'This survey belongs to another team.';
			return json({ message, errors: { ownerId: [message] } }, { status: survey.status });
		}
	}

	const entries = [...form.getAll('files'), ...form.getAll('files[]')];
	if (entries.length === 0) {
		return json({ message: 'Choose at least one file.', errors: { files: ['Choose at least one file.'] } }, { status: 400 });
	}
	if (entries.length > MAX_FILES_PER_REQUEST) {
		const message = `Send at most ${MAX_FILES_PER_REQUEST} files at once.`;
		return json({ message, errors: { files: [message] } }, { status: 400 });
	}

	// one at a time: each file is read whole and thumbnailed, and two cores are shared
	const results: UploadResult[] = [];
	for (const entry of entries) {
		if (typeof entry === 'string') {
			results.push({ ok: false, name: 'upload', message: 'This part of the form is text, not a file.' });
			continue;
		}
		results.push(await storeUpload({ ownerType, ownerId, kind, file: entry, userId: user.id }));
	}
	const stored = results.filter((r) => r.ok).length;
	return json(
		{
			results,
			stored,
			refused: results.length - stored,
			...(stored === 0 ? { message: results.length === 1 ? 'The file was not stored.' : 'None of the files was stored.' } : {})
		},
		{ status: stored > 0 ? 200 : 400 }
	);
};
