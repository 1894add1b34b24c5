export { storeUpload, readStoredFile, storedPath, uploadRoot, type StoreUploadInput } from './store';
export { sanitizeFileName, contentDisposition, nameWithExtension } from './names';
export { sniffType, type SniffedType } from './sniff';
export { checkSize, checkType } from './policy';
export { uploadResponse } from './serve';
