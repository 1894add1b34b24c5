/**
 * The price book and company settings, admin side, through the running app (APP_URL) and the real
 * PostgreSQL behind it. Uploads go through the same multipart form a browser sends.
 */
import { existsSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BASE, DEMO, signIn, type Client } from '../helpers/http';
import { makePng } from '../helpers/images';
import { sequelize } from '$lib/server/db';
import {
	CompanySettings,
	PriceBookItem,
	PriceBookVersion,
	TaxRate
} from '$lib/server/db/models/pricing';
import {
	allPriceItems,
	createDraftVersion,
	publishVersion,
	type PriceItem,
	getActivePriceBook,
	getCompanySettings,
	getLogo,
	priceItems,
	taxRateFor,
	updateCompanySettings,
	type CompanySettingsRow
} from '$lib/server/repositories/pricing';
import { parsePriceBookCsv } from '$lib/server/quotes/price-book-csv';
import { centsToDecimal } from '$lib/server/quotes/price-book-export';
import { config } from '$lib/server/config';

const HEADER = 'sku,description,kind,list_price,cost';
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

/** POST a multipart form (fields and files) to a form action, as a browser without JavaScript. */
function multipart(
	c: Client,
	action: string,
	fields: Record<string, string>,
	files: Record<string, { name: string; bytes: Uint8Array | string; type?: string }>
): Promise<Response> {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.append(k, v);
	for (const [k, f] of Object.entries(files)) {
		const bytes = typeof f.bytes === 'string' ? new TextEncoder().encode(f.bytes) : f.bytes;
		body.append(
			k,
			new File([bytes as BlobPart], f.name, { type: f.type ?? 'application/octet-stream' })
		);
	}
	return fetch(BASE + action, {
		method: 'POST',
		redirect: 'manual',
		headers: { cookie: c.cookie, origin: BASE, accept: 'text/html' },
		body
	});
}

const uploadCsv = (c: Client, csv: string, label = 'Test prices', effectiveDate = '2026-06-01') =>
	multipart(
		c,
		'/admin/price-book?/upload',
		{ label, effectiveDate },
		{ file: { name: 'prices.csv', bytes: csv, type: 'text/csv' } }
	);

async function counts() {
	return { versions: await PriceBookVersion.count(), items: await PriceBookItem.count() };
}

/** The active version's CSV as the app serves it, parsed back into rows of text. */
async function activeCsvRows(admin: Client): Promise<string[]> {
	const active = await getActivePriceBook();
	const res = await admin.get(`/admin/price-book/${active!.id}/csv`);
	expect(res.status).toBe(200);
	return (await res.text()).trim().split('\r\n');
}

let admin: Client;
let rep: Client;
let manager: Client;
let settingsBefore: CompanySettingsRow;
let pricesBefore: { label: string; effectiveDate: string; items: PriceItem[] } | null = null;

beforeAll(async () => {
	[admin, rep, manager] = await Promise.all([
		signIn(DEMO.admin),
		signIn(DEMO.rep),
		signIn(DEMO.manager)
	]);
	settingsBefore = await getCompanySettings();
	const active = await getActivePriceBook();
	if (active)
		pricesBefore = {
			label: active.label,
			effectiveDate: active.effectiveDate,
			items: await allPriceItems(active.id)
		};
});

afterAll(async () => {
	// other suites price quotes from the active book: publish the prices found at the start again
	if (pricesBefore) {
		const id = await createDraftVersion({
			...pricesBefore,
			label: `${pricesBefore.label.replace(/ \(again\)$/, '')} (again)`,
			createdBy: null
		});
		await publishVersion(id, null);
	}
	// leave the demo dealer's rules as the seed made them, for other suites
	const { logoPath: _logo, updatedAt: _at, ...rest } = settingsBefore;
	await updateCompanySettings(rest, null);
	await TaxRate.destroy({ where: { regionCode: ['ZZ-T1', 'ZZ-T2'] } });
	await sequelize.close();
});

describe('the seeded price book', () => {
	it('has one active version priced from the catalogue, with freight and installation', async () => {
		expect(await PriceBookVersion.count({ where: { status: 'active' } })).toBe(1);
		const active = (await getActivePriceBook())!;
		const items = await priceItems(active.id, [
			'TW-L3-13',
			'TW-CH-48C',
			'TW-RB-48',
			'TW-FREIGHT',
			'TW-INSTALL',
			'NO-SUCH-SKU'
		]);
		expect([...items.keys()].sort()).toEqual([
			'TW-CH-48C',
			'TW-FREIGHT',
			'TW-INSTALL',
			'TW-L3-13',
			'TW-RB-48'
		]);
		// seed-data/catalogue.json: TW-L3-13 lists at 2 480 000 ¢ and costs 1 890 000 ¢
		expect(items.get('TW-L3-13')).toEqual({
			sku: 'TW-L3-13',
			description: 'Larkspur 3 · 1.3 t',
			kind: 'truck',
			listCents: 2_480_000,
			costCents: 1_890_000
		});
		expect(items.get('TW-CH-48C')?.kind).toBe('charger');
		expect(items.get('TW-RB-48')?.kind).toBe('setup');
		expect(items.get('TW-FREIGHT')?.kind).toBe('freight');
		expect(items.get('TW-INSTALL')?.kind).toBe('installation');
	});

	it('priceItems answers any number of SKUs with one SQL query', async () => {
		const active = (await getActivePriceBook())!;
		const skus = (await allPriceItems(active.id)).map((i) => i.sku);
		expect(skus.length).toBeGreaterThan(20);
		let queries = 0;
		// Sequelize reads `options.logging` at every query; the type does not declare `options`
		const options = (sequelize as unknown as { options: { logging: unknown } }).options;
		const before = options.logging;
		options.logging = () => {
			queries++;
		};
		try {
			const few = await priceItems(active.id, skus.slice(0, 2));
			const all = await priceItems(active.id, skus);
			expect(few.size).toBe(2);
			expect(all.size).toBe(skus.length);
		} finally {
			options.logging = before;
		}
		expect(queries).toBe(2);
	});
});

describe('uploading a price-book CSV', () => {
	it('imports nothing when one row is bad, and names the row and column', async () => {
		const before = await counts();
		const csv = [
			HEADER,
			'TST-1,First test item,accessory,100.00,60.00',
			'TST-2,Second test item,accessory,200.00,120.00',
			'TST-3,Third test item,spaceship,300.00,180.00',
			'TST-4,Fourth test item,accessory,400.00,240.00'
		].join('\n');
		const res = await uploadCsv(admin, csv);
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('Nothing was imported');
		// the kind of the fourth line is wrong: the header is row 1, so that is row 4
		expect(html).toContain('Row 4: kind "spaceship" is not one of');
		expect(html).toMatch(/<td[^>]*>4<\/td>\s*<td[^>]*>kind<\/td>/);
		expect(await counts()).toEqual(before);
	});

	it('lists every bad row, not just the first', async () => {
		const before = await counts();
		const csv = [
			HEADER,
			'A-1,Good,setup,1.00,1.00',
			'A-2,,setup,1.00,1.00',
			'A-3,Bad price,setup,12,50,1.00',
			'A-1,Repeat,setup,1.00,1.00'
		].join('\n');
		const html = await (await uploadCsv(admin, csv)).text();
		expect(html).toContain('Row 3: description is empty');
		expect(html).toContain('Row 4: has 6 fields but the header has 5');
		expect(html).toContain('Row 5: sku "A-1" repeats the sku of row 2');
		expect(html).toContain('3 problems');
		expect(await counts()).toEqual(before);
	});

	it('refuses a missing file, a non-UTF-8 file, a file over 2 MB and a bad name or date, with messages', async () => {
		const before = await counts();
		const noFile = await multipart(
			admin,
			'/admin/price-book?/upload',
			{ label: 'X', effectiveDate: '2026-06-01' },
			{}
		);
		expect(noFile.status).toBe(400);
		expect(await noFile.text()).toContain('Choose the CSV file to upload.');

		const latin1 = new Uint8Array([
			...new TextEncoder().encode(`${HEADER}\nX-1,Caf`),
			0xe9,
			...new TextEncoder().encode(',setup,1,1\n')
		]);
		const notUtf8 = await multipart(
			admin,
			'/admin/price-book?/upload',
			{ label: 'X', effectiveDate: '2026-06-01' },
			{ file: { name: 'p.csv', bytes: latin1 } }
		);
		expect(notUtf8.status).toBe(400);
		expect(await notUtf8.text()).toContain('is not text in UTF-8');

		const big = `${HEADER}\n` + 'B-1,Padding row,setup,1.00,1.00\n'.repeat(70_000); // ≈ 2.2 MB
		expect(big.length).toBeGreaterThan(2 * 1024 * 1024);
		const tooBig = await uploadCsv(admin, big);
		expect(tooBig.status).toBe(413);
		expect(await tooBig.text()).toContain('at most 2 MB');

		const badFields = await uploadCsv(
			admin,
			`${HEADER}\nOK-1,Fine,setup,1.00,1.00`,
			'',
			'2026-02-30'
		);
		expect(badFields.status).toBe(400);
		const html = await badFields.text();
		expect(html).toContain('Give the version a name');
		expect(html).toContain('Enter the date the prices take effect');
		expect(await counts()).toEqual(before);
	});
});

describe('drafts, publishing and immutability', () => {
	let draftId: string;
	let previousActiveId: string;
	let freightBefore: number;
	const newSku = `TST-${Date.now().toString(36).toUpperCase()}`;

	it('a good CSV creates a draft with exact cents, reviewed against the active version', async () => {
		const active = (await getActivePriceBook())!;
		previousActiveId = active.id;
		freightBefore = (await priceItems(active.id, ['TW-FREIGHT'])).get('TW-FREIGHT')!.listCents;
		// start from the active prices, as an admin would: raise freight by $62.35 and add one item
		const rows = await activeCsvRows(admin);
		expect(rows[0]).toBe(HEADER);
		const freight = centsToDecimal(freightBefore + 6235);
		const edited = rows.map((r) =>
			r.startsWith('TW-FREIGHT,')
				? `TW-FREIGHT,"Freight to site, per truck",freight,${freight},500.00`
				: r
		);
		edited.push(`${newSku},Test item added by the suite,accessory,1234.5,800.05`);
		const res = await uploadCsv(admin, edited.join('\r\n'), 'Suite prices', '2026-07-01');
		expect(res.status).toBe(303);
		const location = res.headers.get('location')!;
		expect(location).toMatch(/^\/admin\/price-book\/[0-9a-f-]{36}\?uploaded=1$/);
		draftId = location.split('/')[3].split('?')[0];

		const draft = (await PriceBookVersion.findByPk(draftId))!;
		expect(draft.status).toBe('draft');
		expect(draft.label).toBe('Suite prices');
		expect(draft.effectiveDate).toBe('2026-07-01');
		expect(await PriceBookItem.count({ where: { versionId: draftId } })).toBe(rows.length);
		const items = await priceItems(draftId, [newSku, 'TW-FREIGHT']);
		// 1234.5 → 123 450 ¢; 800.05 → 80 005 ¢
		expect(items.get(newSku)).toMatchObject({ listCents: 123_450, costCents: 80_005 });
		expect(items.get('TW-FREIGHT')).toMatchObject({
			listCents: freightBefore + 6235,
			costCents: 50_000
		});
		// the active version is untouched
		expect((await getActivePriceBook())!.id).toBe(previousActiveId);

		const page = await admin.get(location);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('1 new');
		expect(html).toContain('0 removed');
		expect(html).toContain('1 changed');
		expect(html).toContain(newSku);
		// on the seeded $650.00 freight: +$62.35 is 62.35 ÷ 650 = 9.59 % of it
		if (freightBefore === 65_000) expect(html).toContain('+$62.35 (+9.59%)');
		else expect(html).toContain('+$62.35 (+');
	});

	it('a draft can be renamed before it is published', async () => {
		const res = await admin.action(`/admin/price-book/${draftId}?/update`, {
			label: 'Suite prices, July',
			effectiveDate: '2026-07-02'
		});
		expect(res.status).toBe(200);
		const draft = (await PriceBookVersion.findByPk(draftId))!;
		expect([draft.label, draft.effectiveDate]).toEqual(['Suite prices, July', '2026-07-02']);
	});

	it('publishing needs the confirm step, then makes the draft active and archives the old one', async () => {
		const unconfirmed = await admin.action(`/admin/price-book/${draftId}?/publish`, {});
		expect(unconfirmed.status).toBe(400);
		expect((await PriceBookVersion.findByPk(draftId))!.status).toBe('draft');

		const res = await admin.action(`/admin/price-book/${draftId}?/publish`, { confirm: 'publish' });
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`/admin/price-book?published=${draftId}`);

		const published = (await PriceBookVersion.findByPk(draftId))!;
		expect(published.status).toBe('active');
		expect(published.publishedAt).toBeInstanceOf(Date);
		expect(published.publishedBy).not.toBeNull();
		expect((await PriceBookVersion.findByPk(previousActiveId))!.status).toBe('archived');
		expect(await PriceBookVersion.count({ where: { status: 'active' } })).toBe(1);
		expect((await getActivePriceBook())!.id).toBe(draftId);
		// a quote priced on the old version still finds its old prices there
		expect((await priceItems(previousActiveId, ['TW-FREIGHT'])).get('TW-FREIGHT')?.listCents).toBe(
			freightBefore
		);
		expect((await priceItems(draftId, ['TW-FREIGHT'])).get('TW-FREIGHT')?.listCents).toBe(
			freightBefore + 6235
		);
	});

	it('a published version cannot be renamed, deleted or published again, through the app or in SQL', async () => {
		for (const id of [draftId, previousActiveId]) {
			const before = (await PriceBookVersion.findByPk(id))!.toJSON();
			const rename = await admin.action(`/admin/price-book/${id}?/update`, {
				label: 'Sneaky edit',
				effectiveDate: '2026-01-01'
			});
			expect(rename.status).toBe(409);
			expect(await rename.text()).toContain('published versions cannot be changed');
			expect(
				(await admin.action(`/admin/price-book/${id}?/delete`, { confirm: 'delete' })).status
			).toBe(409);
			expect(
				(await admin.action(`/admin/price-book/${id}?/publish`, { confirm: 'publish' })).status
			).toBe(409);
			expect((await PriceBookVersion.findByPk(id))!.toJSON()).toEqual(before);
		}
		// the database refuses too, whoever asks
		await expect(
			PriceBookItem.update({ listCents: 1 }, { where: { versionId: draftId, sku: 'TW-FREIGHT' } })
		).rejects.toThrow(/is published; its items cannot be changed/);
		await expect(
			PriceBookItem.create({
				versionId: previousActiveId,
				sku: 'LATE',
				description: 'Late',
				kind: 'setup',
				listCents: 1,
				costCents: 1
			})
		).rejects.toThrow(/is published/);
		await expect(PriceBookVersion.destroy({ where: { id: previousActiveId } })).rejects.toThrow(
			/cannot be deleted/
		);
		expect((await priceItems(draftId, ['TW-FREIGHT'])).get('TW-FREIGHT')?.listCents).toBe(
			freightBefore + 6235
		);
	});

	it('the CSV download reads back through the upload parser as the same items', async () => {
		const res = await admin.get(`/admin/price-book/${draftId}/csv`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toContain('text/csv');
		expect(res.headers.get('content-disposition')).toMatch(
			/^attachment; filename="price-book-suite-prices-july-2026-07-02\.csv"$/
		);
		const parsed = parsePriceBookCsv(await res.text());
		expect(parsed.ok).toBe(true);
		if (!parsed.ok) return;
		expect(parsed.items.map(({ row: _row, ...item }) => item)).toEqual(
			await allPriceItems(draftId)
		);
	});

	it('a draft that leaves an item out shows it as removed, and can be deleted with its items', async () => {
		const rows = await activeCsvRows(admin);
		const dropped = rows[1].split(',')[0];
		const res = await uploadCsv(admin, [HEADER, ...rows.slice(2)].join('\n'), 'To be deleted');
		expect(res.status).toBe(303);
		const id = res.headers.get('location')!.split('/')[3].split('?')[0];
		const review = await (await admin.get(`/admin/price-book/${id}`)).text();
		expect(review).toContain('0 new');
		expect(review).toContain('1 removed');
		expect(review).toContain('0 changed');
		expect(review).toMatch(new RegExp(`<h3[^>]*>Removed</h3>[\\s\\S]*${dropped}`));

		expect((await admin.action(`/admin/price-book/${id}?/delete`, {})).status).toBe(400);
		expect(await PriceBookVersion.findByPk(id)).not.toBeNull();
		const del = await admin.action(`/admin/price-book/${id}?/delete`, { confirm: 'delete' });
		expect(del.status).toBe(303);
		expect(await PriceBookVersion.findByPk(id)).toBeNull();
		expect(await PriceBookItem.count({ where: { versionId: id } })).toBe(0);
	});

	it('lists, searches and pages items from URL parameters', async () => {
		const res = await admin.get('/admin/price-book?q=lithium&kind=battery');
		expect(res.status).toBe(200);
		const html = await res.text();
		expect(html).toContain('TW-B48-410-LI');
		expect(html).not.toContain('TW-B48-460-LA');
		// odd parameters fall back to no filter, page 1: never an error
		expect((await admin.get('/admin/price-book?kind=%00&page=-9&q=%25%5F')).status).toBe(200);
		expect((await admin.get('/admin/price-book/00000000-0000-4000-8000-000000000000')).status).toBe(
			404
		);
		expect((await admin.get('/admin/price-book/not-a-uuid')).status).toBe(404);
	});
});

describe('company settings', () => {
	const valid = {
		dealerName: 'Orrin Bay Lift Service',
		address: '410 Wharfside Avenue\r\nUnit 7\r\nOrrin Bay, WA 98470',
		phone: '+1 360 555 0142',
		email: 'Quotes@OrrinBay-Lift.test',
		repDiscountAuthority: '12.5 %',
		marginFloor: '18',
		depositShare: '25%',
		quoteValidityDays: '45',
		termsText: 'Prices hold until the validity date.',
		currency: 'USD',
		timeZone: 'America/Los_Angeles'
	};

	it('saves percentages as basis points', async () => {
		const res = await admin.action('/admin/settings?/save', valid);
		expect(res.status).toBe(200);
		expect(await res.text()).toContain('Settings saved.');
		const s = await getCompanySettings();
		// 12.5 % = 1 250 bp; 18 % = 1 800 bp; 25 % = 2 500 bp (1 % = 100 bp)
		expect(s).toMatchObject({
			repDiscountAuthorityBp: 1250,
			marginFloorBp: 1800,
			depositShareBp: 2500,
			quoteValidityDays: 45,
			email: 'quotes@orrinbay-lift.test',
			address: '410 Wharfside Avenue\nUnit 7\nOrrin Bay, WA 98470'
		});
	});

	it.each([
		[
			'depositShare',
			'150 %',
			'The deposit share must be between 0 and 100 %; 150 % is more than the whole.'
		],
		['quoteValidityDays', '0', 'A quote must stay valid for at least 1 day.'],
		['quoteValidityDays', '366', 'A quote can stay valid for at most 365 days.'],
		['quoteValidityDays', 'soon', 'Enter a whole number of days from 1 to 365.'],
		['repDiscountAuthority', '-5', 'negative'],
		['marginFloor', '7,5', 'Write decimals after a point: 7.5.'],
		['timeZone', 'Mars/Olympus', 'Choose a time zone from the list.'],
		['currency', 'XXX', 'US dollars'],
		['email', 'not-an-address', 'Enter a valid e-mail address']
	])('refuses %s = %j with a clear message and saves nothing', async (field, value, text) => {
		const before = (await CompanySettings.findByPk(1))!.toJSON();
		const res = await admin.action('/admin/settings?/save', {
			...valid,
			dealerName: 'Should not be saved',
			[field]: value
		});
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain(text);
		expect(html).toContain('Nothing was saved.');
		expect((await CompanySettings.findByPk(1))!.toJSON()).toEqual(before);
	});

	it('adds, changes and removes tax rates by region', async () => {
		const add = await admin.action('/admin/settings?/addTaxRate', {
			regionCode: ' zz-t1 ',
			label: 'Test region',
			rate: '7.25 %'
		});
		expect(add.status).toBe(200);
		expect(await taxRateFor('zz-t1')).toEqual({
			regionCode: 'ZZ-T1',
			label: 'Test region',
			rateBp: 725
		});

		const dup = await admin.action('/admin/settings?/addTaxRate', {
			regionCode: 'ZZ-T1',
			label: 'Again',
			rate: '1'
		});
		expect(dup.status).toBe(409);
		expect(await dup.text()).toContain('ZZ-T1 has a rate already');
		const tooHigh = await admin.action('/admin/settings?/addTaxRate', {
			regionCode: 'ZZ-T2',
			label: 'Too high',
			rate: '101'
		});
		expect(tooHigh.status).toBe(400);
		expect(await taxRateFor('ZZ-T2')).toBeNull();

		const id = (await TaxRate.findOne({ where: { regionCode: 'ZZ-T1' } }))!.id;
		const edit = await admin.action('/admin/settings?/updateTaxRate', {
			id,
			regionCode: 'ZZ-T1',
			label: 'Test region',
			rate: '6.5'
		});
		expect(edit.status).toBe(200);
		expect((await taxRateFor('ZZ-T1'))?.rateBp).toBe(650);
		const badEdit = await admin.action('/admin/settings?/updateTaxRate', {
			id,
			regionCode: 'ZZ-T1',
			label: 'Test region',
			rate: 'lots'
		});
		expect(badEdit.status).toBe(400);
		expect((await taxRateFor('ZZ-T1'))?.rateBp).toBe(650);

		expect((await admin.action('/admin/settings?/removeTaxRate', { id })).status).toBe(200);
		expect(await taxRateFor('ZZ-T1')).toBeNull();
		expect((await admin.action('/admin/settings?/removeTaxRate', { id })).status).toBe(404);
	});

	it('stores a PNG logo under a server-made name and serves it for the preview', async () => {
		const png = makePng(64, 32);
		const res = await multipart(
			admin,
			'/admin/settings?/logo',
			{},
			{ logo: { name: '../../etc/evil name.png', bytes: png, type: 'image/png' } }
		);
		expect(res.status).toBe(200);
		const { logoPath } = await getCompanySettings();
		expect(logoPath).toMatch(/^[0-9a-f-]{36}\.png$/);
		expect(UUID.test(logoPath!.slice(0, 36))).toBe(true);
		expect(existsSync(path.join(path.resolve(config.uploadDir), logoPath!))).toBe(true);
		expect(Buffer.compare((await getLogo())!, png)).toBe(0);

		const preview = await admin.get(`/admin/settings/logo?v=${logoPath}`);
		expect(preview.status).toBe(200);
		expect(preview.headers.get('content-type')).toBe('image/png');
		expect(Buffer.compare(Buffer.from(await preview.arrayBuffer()), png)).toBe(0);
		expect(await (await admin.get('/admin/settings')).text()).toContain(
			`/admin/settings/logo?v=${logoPath}`
		);
	});

	it('refuses a logo that is not PNG or JPEG by its bytes, or is over 2 MB, and keeps the old one', async () => {
		const { logoPath } = await getCompanySettings();
		const fake = await multipart(
			admin,
			'/admin/settings?/logo',
			{},
			{ logo: { name: 'logo.png', bytes: 'GIF89a pretending', type: 'image/png' } }
		);
		expect(fake.status).toBe(400);
		expect(await fake.text()).toContain('Upload the logo as a PNG or JPEG image');
		const huge = Buffer.concat([makePng(8, 8), Buffer.alloc(2 * 1024 * 1024)]);
		const big = await multipart(
			admin,
			'/admin/settings?/logo',
			{},
			{ logo: { name: 'big.png', bytes: huge, type: 'image/png' } }
		);
		expect(big.status).toBe(413);
		expect(await big.text()).toContain('2 MB');
		expect((await getCompanySettings()).logoPath).toBe(logoPath);
	});

	it('removes the logo and its file', async () => {
		const { logoPath } = await getCompanySettings();
		expect((await admin.action('/admin/settings?/removeLogo', {})).status).toBe(200);
		expect((await getCompanySettings()).logoPath).toBeNull();
		expect(await getLogo()).toBeNull();
		expect(existsSync(path.join(path.resolve(config.uploadDir), logoPath!))).toBe(false);
		expect((await admin.get('/admin/settings/logo')).status).toBe(404);
	});
});

describe('only admins', () => {
	it('a rep and a manager get 403 on every page and action here, and nothing changes', async () => {
		const active = (await getActivePriceBook())!;
		const draftRes = await uploadCsv(
			admin,
			`${HEADER}\nROLE-1,Role test,setup,1.00,0.50`,
			'Role test draft'
		);
		const draftId = draftRes.headers.get('location')!.split('/')[3].split('?')[0];
		const taxId = (await TaxRate.findOne({ where: { regionCode: 'HB' } }))!.id;
		const snapshot = async () => ({
			versions: (await PriceBookVersion.findAll({ order: [['id', 'ASC']] })).map((v) => v.toJSON()),
			items: await PriceBookItem.count(),
			settings: (await CompanySettings.findByPk(1))!.toJSON(),
			taxes: (await TaxRate.findAll({ order: [['id', 'ASC']] })).map((t) => t.toJSON())
		});
		const before = await snapshot();

		for (const [who, c] of [
			['rep', rep],
			['manager', manager]
		] as const) {
			for (const p of [
				'/admin/price-book',
				`/admin/price-book/${draftId}`,
				`/admin/price-book/${active.id}/csv`,
				'/admin/settings',
				'/admin/settings/logo'
			]) {
				expect((await c.get(p)).status, `${who} GET ${p}`).toBe(403);
			}
			const actions: [string, Record<string, string>][] = [
				[
					`/admin/price-book/${draftId}?/update`,
					{ label: 'Hijacked', effectiveDate: '2026-01-01' }
				],
				[`/admin/price-book/${draftId}?/publish`, { confirm: 'publish' }],
				[`/admin/price-book/${draftId}?/delete`, { confirm: 'delete' }],
				['/admin/settings?/save', { dealerName: 'Hijacked', depositShare: '1' }],
				['/admin/settings?/addTaxRate', { regionCode: 'ZZ-T2', label: 'Hijacked', rate: '1' }],
				[
					'/admin/settings?/updateTaxRate',
					{ id: taxId, regionCode: 'HB', label: 'Hijacked', rate: '1' }
				],
				['/admin/settings?/removeTaxRate', { id: taxId }],
				['/admin/settings?/removeLogo', {}]
			];
			for (const [action, fields] of actions) {
				expect((await c.action(action, fields)).status, `${who} POST ${action}`).toBe(403);
			}
			const upload = await uploadCsv(c, `${HEADER}\nROLE-2,Role test,setup,1.00,0.50`, 'Hijacked');
			expect(upload.status, `${who} upload`).toBe(403);
			const logo = await multipart(
				c,
				'/admin/settings?/logo',
				{},
				{ logo: { name: 'l.png', bytes: makePng(4, 4), type: 'image/png' } }
			);
			expect(logo.status, `${who} logo`).toBe(403);
		}
		expect(await snapshot()).toEqual(before);
		await admin.action(`/admin/price-book/${draftId}?/delete`, { confirm: 'delete' });
	});
});
