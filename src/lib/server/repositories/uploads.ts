import { Upload } from '../db/models/uploads';
import type { OwnerType, UploadInfo, UploadKind } from '../../uploads';

/** An upload row as plain data, with the server-side names the file routes need. */
export interface UploadRecord extends UploadInfo {
	storedName: string;
	thumbName: string | null;
	sha256: string;
	createdBy: string | null;
}

function toRecord(u: Upload): UploadRecord {
	return {
		id: u.id,
		ownerType: u.ownerType,
		ownerId: u.ownerId,
		kind: u.kind,
		name: u.originalName,
		mime: u.mime,
		sizeBytes: u.sizeBytes,
		width: u.width,
		height: u.height,
		url: `/uploads/${u.id}`,
		thumbUrl: u.thumbName ? `/uploads/${u.id}/thumb` : null,
		createdAt: u.createdAt.toISOString(),
		storedName: u.storedName,
		thumbName: u.thumbName,
		sha256: u.sha256,
		createdBy: u.createdBy
	};
}

/** The public part of a record (no server-side file names). */
export function toInfo(r: UploadRecord): UploadInfo {
	return {
		id: r.id,
		ownerType: r.ownerType,
		ownerId: r.ownerId,
		kind: r.kind,
		name: r.name,
		mime: r.mime,
		sizeBytes: r.sizeBytes,
		width: r.width,
		height: r.height,
		url: r.url,
		thumbUrl: r.thumbUrl,
		createdAt: r.createdAt
	};
}

export async function insertUpload(input: {
	ownerType: OwnerType;
	ownerId: string;
	kind: UploadKind;
	originalName: string;
	storedName: string;
	thumbName: string | null;
	mime: string;
	sizeBytes: number;
	sha256: string;
	width: number | null;
	height: number | null;
	createdBy: string | null;
}): Promise<UploadRecord> {
	return toRecord(await Upload.create(input));
}

export async function findUpload(id: string): Promise<UploadRecord | null> {
	const u = await Upload.findByPk(id);
	return u ? toRecord(u) : null;
}

/** The uploads of one owner, newest first; optionally of one kind. */
export async function listUploads(ownerType: OwnerType, ownerId: string, kind?: UploadKind): Promise<UploadInfo[]> {
	const rows = await Upload.findAll({
		where: kind ? { ownerType, ownerId, kind } : { ownerType, ownerId },
		order: [
			['createdAt', 'DESC'],
			['id', 'ASC']
		]
	});
	return rows.map((u) => toInfo(toRecord(u)));
}
