import { z } from 'zod';
import { OWNER_TYPES, UPLOAD_KINDS } from '../uploads';

/** The text fields of `POST /api/v1/uploads` (the files travel beside them as `files`). */
export const uploadRequestSchema = z.object({
	ownerType: z.enum(OWNER_TYPES, { message: `ownerType must be one of: ${OWNER_TYPES.join(', ')}.` }),
	ownerId: z
		.string({ message: 'ownerId must be the id of the record the files belong to.' })
		.regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i, 'ownerId must be the id of the record the files belong to.'),
	kind: z.enum(UPLOAD_KINDS, { message: `kind must be one of: ${UPLOAD_KINDS.join(', ')}.` })
});
export type UploadRequest = z.infer<typeof uploadRequestSchema>;
