import { describe, expect, it } from 'vitest';
import { checkSize, checkType } from './policy';
import { MAX_UPLOAD_BYTES, formatBytes } from '../../uploads';

describe('checkSize', () => {
	it('refuses an empty file', () => {
		expect(checkSize(0)).toMatch(/empty \(0 bytes\)/);
	});
	it('accepts exactly 15 MB (15 × 1024 × 1024 bytes) and refuses one byte more', () => {
		expect(MAX_UPLOAD_BYTES).toBe(15_728_640);
		expect(checkSize(MAX_UPLOAD_BYTES)).toBeNull();
		expect(checkSize(MAX_UPLOAD_BYTES + 1)).toMatch(/the limit is 15 MB a file/);
	});
	it('says how large a 16 MB (16 000 000 bytes) file is', () => {
		expect(checkSize(16_000_000)).toBe('This file is 15.3 MB; the limit is 15 MB a file. Send a smaller file.');
	});
});

describe('checkType', () => {
	const pdf = { mime: 'application/pdf', ext: 'pdf' } as const;
	const png = { mime: 'image/png', ext: 'png' } as const;
	const heic = { mime: 'image/heic', ext: 'heic' } as const;
	it('refuses a PDF as a photo, naming what it is', () => {
		expect(checkType(pdf, 'photo')).toBe('This file is a PDF document; a photo must be JPEG, PNG, WebP or HEIC.');
	});
	it('accepts a PDF as a floor plan and a PNG as a photo or logo', () => {
		expect(checkType(pdf, 'floor-plan')).toBeNull();
		expect(checkType(png, 'photo')).toBeNull();
		expect(checkType(png, 'logo')).toBeNull();
	});
	it('refuses HEIC as a logo (quote PDFs embed PNG and JPEG only)', () => {
		expect(checkType(heic, 'logo')).toMatch(/a logo must be PNG or JPEG/);
	});
	it('refuses unknown bytes with a message that says the contents were checked', () => {
		expect(checkType(null, 'photo')).toMatch(/contents were checked, not its name/);
	});
});

describe('formatBytes', () => {
	it('uses 1024-byte units', () => {
		expect(formatBytes(1)).toBe('1 byte');
		expect(formatBytes(2048)).toBe('2.0 KB');
		expect(formatBytes(15 * 1024 * 1024)).toBe('15.0 MB');
	});
});
