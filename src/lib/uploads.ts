/**
 * Upload facts shared by the browser (FileDrop) and the server (storeUpload). No server imports.
 */

export const OWNER_TYPES = ['customer', 'survey', 'company'] as const;
export type OwnerType = (typeof OWNER_TYPES)[number];

export const UPLOAD_KINDS = ['photo', 'floor-plan', 'logo'] as const;
export type UploadKind = (typeof UPLOAD_KINDS)[number];

/** 15 MB a file (15 × 1024 × 1024 bytes). */
export const MAX_UPLOAD_BYTES = 15 * 1024 * 1024;
/** the limit as people read it */
export const MAX_UPLOAD_TEXT = `${MAX_UPLOAD_BYTES / (1024 * 1024)} MB`;
/** files in one request to POST /api/v1/uploads */
export const MAX_FILES_PER_REQUEST = 20;

/** The file types Traywise recognises from their bytes. */
export type SniffedMime =
	| 'image/jpeg'
	| 'image/png'
	| 'image/webp'
	| 'image/heic'
	| 'image/heif'
	| 'application/pdf';

export const TYPE_LABEL: Record<SniffedMime, string> = {
	'image/jpeg': 'JPEG image',
	'image/png': 'PNG image',
	'image/webp': 'WebP image',
	'image/heic': 'HEIC image',
	'image/heif': 'HEIF image',
	'application/pdf': 'PDF document'
};

/**
 * Which types each kind accepts. A logo goes into quote PDFs, whose renderer takes PNG and JPEG
 * only; a floor plan may be a PDF or a photo of the plan on the wall.
 */
export const KIND_TYPES: Record<UploadKind, readonly SniffedMime[]> = {
	photo: ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'],
	'floor-plan': ['application/pdf', 'image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'],
	logo: ['image/png', 'image/jpeg']
};

/** What each kind's allowed types are called in messages. */
export const KIND_TYPES_TEXT: Record<UploadKind, string> = {
	photo: 'JPEG, PNG, WebP or HEIC',
	'floor-plan': 'PDF, JPEG, PNG, WebP or HEIC',
	logo: 'PNG or JPEG'
};

export const KIND_LABEL: Record<UploadKind, string> = {
	photo: 'photo',
	'floor-plan': 'floor plan',
	logo: 'logo'
};

/** The `accept` attribute a file input offers for each kind (a hint to the picker, not a check). */
export const KIND_ACCEPT: Record<UploadKind, string> = {
	photo: 'image/jpeg,image/png,image/webp,image/heic,image/heif,.jpg,.jpeg,.png,.webp,.heic,.heif',
	'floor-plan':
		'application/pdf,image/jpeg,image/png,image/webp,image/heic,image/heif,.pdf,.jpg,.jpeg,.png,.webp,.heic,.heif',
	logo: 'image/png,image/jpeg,.png,.jpg,.jpeg'
};

/** What the server answers for a stored file. */
export interface UploadInfo {
	id: string;
	ownerType: OwnerType;
	ownerId: string;
	kind: UploadKind;
	/** sanitised display name */
	name: string;
	mime: string;
	sizeBytes: number;
	width: number | null;
	height: number | null;
	url: string;
	/** null when no thumbnail could be made (PDFs; HEIC where the server cannot decode it) */
	thumbUrl: string | null;
	createdAt: string;
}

export type UploadResult =
	| { ok: true; name: string; upload: UploadInfo }
	| { ok: false; name: string; message: string };

/** Bytes as a short figure: 1 KB = 1024 bytes, one decimal above 10 KB. */
export function formatBytes(bytes: number): string {
	if (!Number.isFinite(bytes) || bytes < 0) return '—';
	if (bytes < 1024) return `${bytes} byte${bytes === 1 ? '' : 's'}`;
	const kb = bytes / 1024;
	if (kb < 1024) return `${kb < 10 ? kb.toFixed(1) : Math.round(kb)} KB`;
	const mb = kb / 1024;
	return `${mb < 100 ? mb.toFixed(1) : Math.round(mb)} MB`;
}

/** The message for a file over the limit; the browser and the server say the same thing. */
export function tooLargeMessage(bytes: number): string {
	return `This file is ${formatBytes(bytes)}; the limit is ${MAX_UPLOAD_TEXT} a file. Send a smaller file.`;
}

export const EMPTY_FILE_MESSAGE = 'This file is empty (0 bytes). Choose the file again.';
