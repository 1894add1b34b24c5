import { createHash, randomUUID } from 'node:crypto';
import { mkdir, readFile, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import sharp from 'sharp';
import { config } from '../config';
import { insertUpload, toInfo, type UploadRecord } from '../repositories/uploads';
import { TYPE_LABEL, type OwnerType, type UploadKind, type UploadResult } from '../../uploads';
import { sanitizeFileName } from './names';
import { checkSize, checkType } from './policy';
import { sniffType, type SniffedType } from './sniff';

// Thumbnails are small one-off jobs; libvips' operation cache would only hold memory.
sharp.cache(false);

/** Longest side of a thumbnail, px (sharp to fit, never enlarged). */
export const THUMB_SIZE_PX = 480;
/** Images above this many pixels are refused before decoding (a small file can claim huge dimensions). */
export const MAX_IMAGE_PIXELS = 80_000_000;

const STORED_NAME = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}(\.thumb)?\.(jpg|png|webp|heic|heif|pdf)$/;

/** The absolute upload folder (UPLOAD_DIR, outside static/). */
export function uploadRoot(): string {
	return path.resolve(config.uploadDir);
}

/**
 * The absolute path of a stored file. Only names the server made (`<uuid>[.thumb].<ext>`) are
 * accepted, and the result must lie inside the upload folder.
 */
export function storedPath(storedName: string): string {
	if (!STORED_NAME.test(storedName)) throw new Error(`not a stored upload name: ${JSON.stringify(storedName)}`);
	const root = uploadRoot();
	const full = path.join(root, storedName);
	if (path.dirname(full) !== root) throw new Error('stored upload path escapes the upload folder');
	return full;
}

interface ImageFacts {
	width: number | null;
	height: number | null;
	thumb: Buffer | null;
}

/**
 * Dimensions (as displayed, after EXIF rotation) and a WebP thumbnail, made with sharp.
 * JPEG, PNG and WebP that do not decode are refused; HEIC/HEIF is kept without a thumbnail when
 * this server's image library cannot decode it (its prebuilt build has no HEVC decoder).
 */
async function imageFacts(bytes: Buffer, sniffed: SniffedType): Promise<ImageFacts | { error: string }> {
	if (sniffed.mime === 'application/pdf') return { width: null, height: null, thumb: null };
	const heif = sniffed.mime === 'image/heic' || sniffed.mime === 'image/heif';
	const options = { limitInputPixels: MAX_IMAGE_PIXELS, failOn: 'error' } as const;
	let width: number | null = null;
	let height: number | null = null;
	try {
		const meta = await sharp(bytes, options).metadata();
		if (meta.width && meta.height) {
			const turned = (meta.orientation ?? 1) >= 5;
			width = turned ? meta.height : meta.width;
			height = turned ? meta.width : meta.height;
		}
		if (width && height && width * height > MAX_IMAGE_PIXELS) {
			return {
				error: `This image is ${width} × ${height} pixels; the limit is ${MAX_IMAGE_PIXELS / 1_000_000} megapixels.`
			};
		}
		const thumb = await sharp(bytes, options)
			.rotate()
			.resize({ width: THUMB_SIZE_PX, height: THUMB_SIZE_PX, fit: 'inside', withoutEnlargement: true })
			.webp({ quality: 78 })
			.toBuffer();
		return { width, height, thumb };
	} catch {
		if (heif) return { width, height, thumb: null };
		return {
			error: `This file starts like a ${TYPE_LABEL[sniffed.mime]} but could not be read as one; it may be damaged or cut short.`
		};
	}
}

export interface StoreUploadInput {
	ownerType: OwnerType;
	/** the owning record; the caller checks it exists and that the user may attach to it */
	ownerId: string;
	kind: UploadKind;
	file: File;
	/** the signed-in user who sent it */
	userId: string | null;
}

/**
 * Checks and stores one uploaded file. Refuses (with a message, storing nothing) an empty file, a
 * file over 15 MB, and a file whose bytes are not one of the types the kind accepts, whatever its
 * name says. The stored file is `<uuid>.<ext from the bytes>` under UPLOAD_DIR; the sent name is
 * sanitised and kept for display only. Images get a WebP thumbnail `<uuid>.thumb.webp`.
 * Throws only on server faults (disk, database); the files written are removed first.
 */
export async function storeUpload(input: StoreUploadInput): Promise<UploadResult> {
	const name = sanitizeFileName(input.file.name);
	const refuse = (message: string): UploadResult => ({ ok: false, name, message });

	const sizeProblem = checkSize(input.file.size);
	if (sizeProblem) return refuse(sizeProblem);

	const bytes = Buffer.from(await input.file.arrayBuffer());
	// the declared size and the bytes received agree in practice; check what was really read
	const readProblem = checkSize(bytes.length);
	if (readProblem) return refuse(readProblem);

	const sniffed = sniffType(bytes);
	const typeProblem = checkType(sniffed, input.kind);
	if (typeProblem || !sniffed) return refuse(typeProblem ?? 'Unknown file type.');

	const facts = await imageFacts(bytes, sniffed);
	if ('error' in facts) return refuse(facts.error);

	const base = randomUUID();
	const storedName = `${base}.${sniffed.ext}`;
	const thumbName = facts.thumb ? `${base}.thumb.webp` : null;
	const written: string[] = [];
	try {
		await mkdir(uploadRoot(), { recursive: true });
		const target = storedPath(storedName);
		await writeFile(target, bytes, { flag: 'wx', mode: 0o640 });
		written.push(target);
		if (thumbName && facts.thumb) {
			const thumbTarget = storedPath(thumbName);
			await writeFile(thumbTarget, facts.thumb, { flag: 'wx', mode: 0o640 });
			written.push(thumbTarget);
		}
		const record = await insertUpload({
			ownerType: input.ownerType,
			ownerId: input.ownerId,
			kind: input.kind,
			originalName: name,
			storedName,
			thumbName,
			mime: sniffed.mime,
			sizeBytes: bytes.length,
			sha256: createHash('sha256').update(bytes).digest('hex'),
			width: facts.width,
			height: facts.height,
			createdBy: input.userId
		});
		return { ok: true, name, upload: toInfo(record) };
	} catch (err) {
		await Promise.all(written.map((f) => unlink(f).catch(() => undefined)));
		throw err;
	}
}

/** The bytes of a stored upload or of its thumbnail; null when the file is missing on disk. */
export async function readStoredFile(record: UploadRecord, which: 'original' | 'thumb'): Promise<Buffer | null> {
	const name = which === 'thumb' ? record.thumbName : record.storedName;
	if (!name) return null;
	try {
		return await readFile(storedPath(name));
	} catch (err) {
		if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
		throw err;
	}
}
