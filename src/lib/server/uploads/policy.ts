import {
	EMPTY_FILE_MESSAGE,
	KIND_LABEL,
	KIND_TYPES,
	KIND_TYPES_TEXT,
	MAX_UPLOAD_BYTES,
	TYPE_LABEL,
	tooLargeMessage,
	type UploadKind
} from '../../uploads';
import type { SniffedType } from './sniff';

/** The size check, before any byte is read: a message when refused, else null. */
export function checkSize(sizeBytes: number): string | null {
	if (sizeBytes <= 0) return EMPTY_FILE_MESSAGE;
	if (sizeBytes > MAX_UPLOAD_BYTES) return tooLargeMessage(sizeBytes);
	return null;
}

/** The type check against what the kind accepts: a message when refused, else null. */
export function checkType(sniffed: SniffedType | null, kind: UploadKind): string | null {
	const wanted = KIND_TYPES_TEXT[kind];
	if (!sniffed) {
		return `This file is not a type Traywise accepts; a ${KIND_LABEL[kind]} must be ${wanted}. (The file's contents were checked, not its name.)`;
	}
	if (!KIND_TYPES[kind].includes(sniffed.mime)) {
		return `This file is a ${TYPE_LABEL[sniffed.mime]}; a ${KIND_LABEL[kind]} must be ${wanted}.`;
	}
	return null;
}
