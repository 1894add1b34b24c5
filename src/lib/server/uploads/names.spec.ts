import { describe, expect, it } from 'vitest';
import { MAX_NAME_LENGTH, contentDisposition, nameWithExtension, sanitizeFileName } from './names';

describe('sanitizeFileName', () => {
	it('keeps an ordinary name as it is', () => {
		expect(sanitizeFileName('Battery room north wall.jpg')).toBe('Battery room north wall.jpg');
		expect(sanitizeFileName('Plan über Halle 2.pdf')).toBe('Plan über Halle 2.pdf');
	});
	it('keeps only the last segment of a POSIX path trick', () => {
		expect(sanitizeFileName('../../etc/passwd')).toBe('passwd');
		expect(sanitizeFileName('/var/www/../x.png')).toBe('x.png');
	});
	it('keeps only the last segment of a Windows path trick', () => {
		expect(sanitizeFileName('..\\x')).toBe('x');
		expect(sanitizeFileName('C:\\Users\\rep\\Desktop\\plan.pdf')).toBe('plan.pdf');
	});
	it('never returns a dot-only or empty name', () => {
		expect(sanitizeFileName('..')).toBe('upload');
		expect(sanitizeFileName('../..')).toBe('upload');
		expect(sanitizeFileName('')).toBe('upload');
		expect(sanitizeFileName('   ')).toBe('upload');
		expect(sanitizeFileName(undefined)).toBe('upload');
		expect(sanitizeFileName('.hidden')).toBe('hidden');
	});
	it('drops NUL and other control characters', () => {
		expect(sanitizeFileName('photo.jpg\u0000.pdf')).toBe('photo.jpg.pdf');
		expect(sanitizeFileName('a\u0001b\u001fc\u007fd\u009f.png')).toBe('abcd.png');
		expect(sanitizeFileName('line\nbreak.png')).toBe('line break.png');
	});
	it('drops right-to-left overrides, isolates and zero-width characters', () => {
		// U+202E would make "photo\u202Egpj.exe" display as "photoexe.jpg"
		expect(sanitizeFileName('photo\u202Egpj.exe')).toBe('photogpj.exe');
		expect(sanitizeFileName('a\u2066b\u2069c\u200bd\ufeff.png')).toBe('abcd.png');
		expect(sanitizeFileName('\u202Dplan\u202C.pdf')).toBe('plan.pdf');
	});
	it('replaces characters reserved on file systems and in headers', () => {
		expect(sanitizeFileName('a<b>c:d"e|f?g*.png')).toBe('a_b_c_d_e_f_g_.png');
	});
	it(`caps very long names at ${MAX_NAME_LENGTH} characters and keeps the extension`, () => {
		const out = sanitizeFileName('x'.repeat(5000) + '.jpeg');
		expect(Array.from(out)).toHaveLength(MAX_NAME_LENGTH);
		expect(out.endsWith('.jpeg')).toBe(true);
	});
	it('never splits a character made of two UTF-16 units', () => {
		const out = sanitizeFileName('🔋'.repeat(300));
		expect(Array.from(out)).toHaveLength(MAX_NAME_LENGTH);
		expect(out).toBe('🔋'.repeat(MAX_NAME_LENGTH));
	});
});

describe('nameWithExtension', () => {
	it('keeps a matching extension and appends the real one otherwise', () => {
		expect(nameWithExtension('dock.JPEG', 'jpg')).toBe('dock.JPEG');
		expect(nameWithExtension('plan.jpg', 'pdf')).toBe('plan.jpg.pdf');
		expect(nameWithExtension('upload', 'png')).toBe('upload.png');
	});
});

describe('contentDisposition', () => {
	it('gives an ASCII fallback and the UTF-8 name (RFC 6266 / RFC 8187)', () => {
		expect(contentDisposition('inline', 'Plan über Halle.pdf')).toBe(
			`inline; filename="Plan _ber Halle.pdf"; filename*=UTF-8''Plan%20%C3%BCber%20Halle.pdf`
		);
	});
	it('cannot be broken out of by quotes, semicolons or line breaks', () => {
		const header = contentDisposition('attachment', 'a";\r\nSet-Cookie: x=1;.png');
		expect(header).not.toMatch(/[\r\n]/);
		expect(header.split('"')).toHaveLength(3);
		expect(header.startsWith('attachment; filename="a__ Set-Cookie_ x=1_.png"')).toBe(true);
	});
});
