import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BASE, DEMO, signIn, type Client } from '../helpers/http';
import { sequelize } from '$lib/server/db';
import { User } from '$lib/server/db/models';
import { Upload } from '$lib/server/db/models/uploads';
import { createCustomer } from '$lib/server/repositories/customers';

const UPLOAD_DIR = path.resolve(process.env.UPLOAD_DIR ?? '.data/uploads');
const STORED = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}(\.thumb)?\.(jpg|png|webp|heic|heif|pdf)$/;

let rep: Client;
let customerId: string;
let png: Buffer;
// a minimal PDF 1.4 file: header, one object, trailer (ISO 32000-1 §7.5)
const pdf = Buffer.from('%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n');

interface Part {
	name: string;
	bytes: Uint8Array | string;
	type?: string;
}

/** POST /api/v1/uploads as multipart, the way FileDrop's XMLHttpRequest sends it. */
async function upload(cookie: string, fields: Record<string, string>, files: Part[]) {
	const form = new FormData();
	for (const [k, v] of Object.entries(fields)) form.append(k, v);
	for (const f of files) form.append('files', new Blob([typeof f.bytes === 'string' ? f.bytes : new Uint8Array(f.bytes)], { type: f.type ?? 'application/octet-stream' }), f.name);
	const headers: Record<string, string> = { origin: BASE, accept: 'application/json' };
	if (cookie) headers.cookie = cookie;
	const res = await fetch(`${BASE}/api/v1/uploads`, { method: 'POST', headers, body: form, redirect: 'manual' });
	return { status: res.status, body: await res.json() };
}

const photo = () => ({ ownerType: 'customer', ownerId: customerId, kind: 'photo' });

function storedFiles(): string[] {
	return readdirSync(UPLOAD_DIR).sort();
}

beforeAll(async () => {
	rep = await signIn(DEMO.rep);
	const user = (await User.findOne({ where: { email: DEMO.rep } }))!;
	const saved = await createCustomer({ name: `Upload test yard ${Date.now()}`, accountNumber: '', notes: '' }, { id: user.id, teamId: user.teamId });
	if (!saved.ok) throw new Error('no customer');
	customerId = saved.id;
	png = await sharp({ create: { width: 900, height: 600, channels: 3, background: '#1c605d' } }).png().toBuffer();
});

afterAll(async () => {
	await sequelize.close();
});

describe('POST /api/v1/uploads', () => {
	it('stores a PNG photo as <uuid>.png inside UPLOAD_DIR with a WebP thumbnail', async () => {
		const { status, body } = await upload(rep.cookie, photo(), [{ name: 'Battery room.png', bytes: png, type: 'image/png' }]);
		expect(status).toBe(200);
		expect(body.stored).toBe(1);
		const [result] = body.results;
		expect(result).toMatchObject({ ok: true, name: 'Battery room.png' });
		expect(result.upload).toMatchObject({ mime: 'image/png', sizeBytes: png.length, width: 900, height: 600, kind: 'photo' });

		const row = (await Upload.findByPk(result.upload.id))!;
		expect(row.storedName).toMatch(STORED);
		expect(row.storedName.endsWith('.png')).toBe(true);
		expect(row.sha256).toBe(createHash('sha256').update(png).digest('hex'));
		expect(readFileSync(path.join(UPLOAD_DIR, row.storedName)).equals(png)).toBe(true);
		const thumb = readFileSync(path.join(UPLOAD_DIR, row.thumbName!));
		expect(thumb.subarray(8, 12).toString('latin1')).toBe('WEBP');
		expect((await sharp(thumb).metadata()).width).toBe(480);
	});

	it('refuses a PDF renamed .jpg as a photo, and stores nothing', async () => {
		const rows = await Upload.count();
		const files = storedFiles();
		const { status, body } = await upload(rep.cookie, photo(), [{ name: 'dock.jpg', bytes: pdf, type: 'image/jpeg' }]);
		expect(status).toBe(400);
		expect(body.results[0]).toEqual({
			ok: false,
			name: 'dock.jpg',
			message: 'This file is a PDF document; a photo must be JPEG, PNG, WebP or HEIC.'
		});
		expect(await Upload.count()).toBe(rows);
		expect(storedFiles()).toEqual(files);
	});

	it('accepts the same PDF as a floor plan, stored as .pdf with no thumbnail', async () => {
		const { status, body } = await upload(rep.cookie, { ...photo(), kind: 'floor-plan' }, [{ name: 'plan.jpg', bytes: pdf }]);
		expect(status).toBe(200);
		const info = body.results[0].upload;
		expect(info.mime).toBe('application/pdf');
		expect(info.thumbUrl).toBeNull();
		expect((await Upload.findByPk(info.id))!.storedName).toMatch(/\.pdf$/);
		const res = await rep.get(`/uploads/${info.id}`);
		expect(res.headers.get('content-type')).toBe('application/pdf');
		// the download name gets the real extension
		expect(res.headers.get('content-disposition')).toContain('filename="plan.jpg.pdf"');
		expect((await rep.get(`/uploads/${info.id}/thumb`)).status).toBe(404);
	});

	it('refuses a 16 MB file (16 000 000 bytes) with a clear message, and stores nothing', async () => {
		const rows = await Upload.count();
		const files = storedFiles();
		const big = Buffer.alloc(16_000_000);
		png.copy(big); // a real PNG start: refused for its size, not its type
		const { status, body } = await upload(rep.cookie, photo(), [{ name: 'huge.png', bytes: big, type: 'image/png' }]);
		expect(status).toBe(400);
		expect(body.results[0].message).toBe('This file is 15.3 MB; the limit is 15 MB a file. Send a smaller file.');
		expect(await Upload.count()).toBe(rows);
		expect(storedFiles()).toEqual(files);
	});

	it('refuses a zero-byte file', async () => {
		const rows = await Upload.count();
		const { status, body } = await upload(rep.cookie, photo(), [{ name: 'empty.png', bytes: new Uint8Array() }]);
		expect(status).toBe(400);
		expect(body.results[0].message).toBe('This file is empty (0 bytes). Choose the file again.');
		expect(await Upload.count()).toBe(rows);
	});

	it('stores a file named with ../ safely: sanitised name, server-made path inside UPLOAD_DIR', async () => {
		const before = new Set(storedFiles());
		const { status, body } = await upload(rep.cookie, photo(), [
			{ name: '../../etc/passwd.png', bytes: png },
			{ name: '..\\..\\boot.ini.png', bytes: png },
			{ name: 'site\u202Egnp.exe', bytes: png }
		]);
		expect(status).toBe(200);
		expect(body.results.map((r: { name: string }) => r.name)).toEqual(['passwd.png', 'boot.ini.png', 'sitegnp.exe']);
		const added = storedFiles().filter((f) => !before.has(f));
		expect(added).toHaveLength(6); // three originals, three thumbnails
		for (const f of added) {
			expect(f).toMatch(STORED);
			expect(statSync(path.join(UPLOAD_DIR, f)).isFile()).toBe(true);
		}
		for (const r of body.results) {
			const row = (await Upload.findByPk(r.upload.id))!;
			expect(path.dirname(path.resolve(UPLOAD_DIR, row.storedName))).toBe(UPLOAD_DIR);
			expect(row.originalName).not.toMatch(/[\\/\u202E]/);
		}
	});

	it('answers several files with one result each, in order', async () => {
		const { status, body } = await upload(rep.cookie, photo(), [
			{ name: 'a.png', bytes: png },
			{ name: 'page.png', bytes: '<!doctype html><script>alert(1)</script>' },
			{ name: 'cut.png', bytes: png.subarray(0, 60) },
			{ name: 'b.webp', bytes: await sharp(png).webp().toBuffer() }
		]);
		expect(status).toBe(200);
		expect(body.stored).toBe(2);
		expect(body.refused).toBe(2);
		expect(body.results.map((r: { ok: boolean }) => r.ok)).toEqual([true, false, false, true]);
		expect(body.results[1].message).toMatch(/not a type Traywise accepts.*contents were checked, not its name/);
		expect(body.results[2].message).toMatch(/starts like a PNG image but could not be read/);
		expect(body.results[3].upload.mime).toBe('image/webp');
	});

	it('refuses bad fields, an unknown customer and a missing file with 4xx and messages', async () => {
		const bad = await upload(rep.cookie, { ownerType: 'truck', ownerId: '12', kind: 'selfie' }, [{ name: 'a.png', bytes: png }]);
		expect(bad.status).toBe(400);
		expect(Object.keys(bad.body.errors).sort()).toEqual(['kind', 'ownerId', 'ownerType']);
		const unknown = await upload(rep.cookie, { ...photo(), ownerId: '00000000-0000-4000-8000-000000000000' }, [{ name: 'a.png', bytes: png }]);
		expect(unknown.status).toBe(404);
		expect(unknown.body.message).toBe('There is no such customer.');
		const none = await upload(rep.cookie, photo(), []);
		expect(none.status).toBe(400);
		expect(none.body.message).toBe('Choose at least one file.');
	});

	it('lets only admins attach a company logo', async () => {
		const company = { ownerType: 'company', ownerId: '00000000-0000-4000-8000-0000000000c0', kind: 'logo' };
		expect((await upload(rep.cookie, company, [{ name: 'logo.png', bytes: png }])).status).toBe(403);
		const admin = await signIn(DEMO.admin);
		expect((await upload(admin.cookie, company, [{ name: 'logo.png', bytes: png }])).status).toBe(200);
	});

	it('refuses a signed-out upload with 401 and stores nothing', async () => {
		const rows = await Upload.count();
		const res = await upload('', photo(), [{ name: 'a.png', bytes: png }]);
		expect(res.status).toBe(401);
		expect(await Upload.count()).toBe(rows);
	});
});

describe('GET /uploads/[id]', () => {
	let id: string;
	beforeAll(async () => {
		const { body } = await upload(rep.cookie, photo(), [{ name: 'Übersicht Halle; 2.png', bytes: png }]);
		id = body.results[0].upload.id;
	});

	it('serves the bytes to signed-in staff with nosniff and a safe Content-Disposition', async () => {
		for (const email of [DEMO.rep, DEMO.rep2, DEMO.manager, DEMO.admin]) {
			const res = await (await signIn(email)).get(`/uploads/${id}`);
			expect(res.status, email).toBe(200);
			expect(Buffer.from(await res.arrayBuffer()).equals(png)).toBe(true);
		}
		const res = await rep.get(`/uploads/${id}`);
		expect(res.headers.get('content-type')).toBe('image/png');
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
		expect(res.headers.get('content-disposition')).toBe(
			`inline; filename="_bersicht Halle_ 2.png"; filename*=UTF-8''%C3%9Cbersicht%20Halle%3B%202.png`
		);
		const thumb = await rep.get(`/uploads/${id}/thumb`);
		expect(thumb.status).toBe(200);
		expect(thumb.headers.get('content-type')).toBe('image/webp');
		expect(thumb.headers.get('x-content-type-options')).toBe('nosniff');
	});

	it('answers a repeat request with 304 when the ETag matches', async () => {
		const first = await rep.get(`/uploads/${id}`);
		const etag = first.headers.get('etag')!;
		const again = await rep.get(`/uploads/${id}`, { headers: { 'if-none-match': etag } });
		expect(again.status).toBe(304);
	});

	it('refuses a signed-out request: a redirect to sign in, not the file', async () => {
		const res = await fetch(`${BASE}/uploads/${id}`, { redirect: 'manual' });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`/login?next=${encodeURIComponent(`/uploads/${id}`)}`);
		expect(res.headers.get('content-type') ?? '').not.toContain('image/');
		const thumb = await fetch(`${BASE}/uploads/${id}/thumb`, { redirect: 'manual' });
		expect(thumb.status).toBe(303);
	});

	it('answers 404 for an unknown or malformed id', async () => {
		expect((await rep.get('/uploads/00000000-0000-4000-8000-000000000000')).status).toBe(404);
		expect((await rep.get('/uploads/..%2F..%2Fetc%2Fpasswd')).status).toBe(404);
	});
});
