import PDFDocument from 'pdfkit';
import { formatMoney, formatBp } from '../../money';
import { quoteDate } from '../../format';
import { formatAirFlow, formatArea, formatLength, formatMass } from '../../units';
import { compartmentScene } from '../../drawing/compartment';
import { drawCompartmentScene } from './drawing';
import { registerFonts, printable } from './fonts';
import type { QuoteView } from '../repositories/quotes';
import type { EvaluateResult, ResolvedInput } from '../rules/types';
import { priceLine, type LineKind } from '../quotes/pricing';
import { customerSetupText, showsTaxLine, type CustomerCheck } from '../quotes/customer-text';

/** What the PDF needs from the company settings. */
export interface PdfSettings {
	dealerName: string;
	dealerAddress: string;
	dealerPhone?: string | null;
	dealerEmail?: string | null;
	logo?: Buffer | null;
	currency?: string;
	timeZone?: string;
}

const INK = '#0f172a';
const MUTED = '#475569';
const TIDE = '#1c605d';
const EMBER = '#92400e';
const RED = '#b91c1c';
const MARGIN = 48;

function figure(value: number | null, unit: string): string {
	if (value == null) return '—';
	if (unit === 'mm') return formatLength(value, 'metric');
	if (unit === 'kg') return formatMass(value, 'metric');
	if (unit === 'm³/h' || unit === 'm3/h') return formatAirFlow(value, 'metric');
	if (unit === 'm²' || unit === 'm2') return formatArea(value, 'metric');
	return `${Number.isInteger(value) ? value : value.toFixed(2)} ${unit}`;
}


/**
 * The customer's quote document: dealer and customer, site summary, the chosen setup and why, the
 * checks with their numbers in both unit systems, the to-scale drawing, the priced lines (no cost
 * or margin), tax, total, deposit, validity, terms, safety cautions and an acceptance block; the
 * quote number with revision and the page number on every page.
 */
export async function buildQuotePdf(view: QuoteView, settings: PdfSettings): Promise<Buffer> {
	const rev = view.revision;
	const result = rev.engineResult as EvaluateResult;
	const input = rev.engineInput as ResolvedInput;
	const setup = result.setups.find((s) => s.id === rev.setupId) ?? result.setups[0];
	const currency = settings.currency ?? 'USD';
	const tz = settings.timeZone ?? 'UTC';
	const money = (c: number) => formatMoney(c, currency);

	const doc = new PDFDocument({
		size: 'LETTER',
		margins: { top: MARGIN + 8, bottom: MARGIN + 16, left: MARGIN, right: MARGIN },
		bufferPages: true,
		info: { Title: `Quote ${rev.number}`, Author: printable(settings.dealerName), Subject: 'Battery handling quote', Creator: 'Traywise' },
		autoFirstPage: true
	});
	registerFonts(doc);
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});

	const W = doc.page.width - MARGIN * 2;
	const heading = (text: string) => {
		ensure(40);
		doc.moveDown(0.6).font('Bold').fontSize(13).fillColor(TIDE).text(text, MARGIN, doc.y, { width: W });
		doc.moveTo(MARGIN, doc.y + 2).lineTo(MARGIN + W, doc.y + 2).lineWidth(0.6).strokeColor(TIDE).stroke();
		doc.moveDown(0.4).font('Body').fontSize(9.5).fillColor(INK);
	};
	const para = (text: string, opts: PDFKit.Mixins.TextOptions = {}) => {
		doc.font('Body').fontSize(9.5).fillColor(INK).text(printable(text), MARGIN, doc.y, { width: W, ...opts });
	};
	/** Starts a new page when `space` does not fit; true when it did. */
	function ensure(space: number): boolean {
		if (doc.y + space <= doc.page.height - doc.page.margins.bottom) return false;
		doc.addPage();
		return true;
	}

	/** A column of a table: left edge, width and alignment, for its header and its cells alike. */
	interface Column {
		header: string;
		x: number;
		width: number;
		align: 'left' | 'right';
	}
	/** The header row of a table (again at the top of each page the table continues on). */
	const tableHeader = (cols: readonly Column[], caption?: string) => {
		if (caption) {
			doc.font('Semi').fontSize(9).fillColor(TIDE).text(caption, MARGIN, doc.y, { width: W });
			doc.moveDown(0.2);
		}
		doc.font('Semi').fontSize(8.5).fillColor(MUTED);
		const y = doc.y;
		for (const c of cols) doc.text(c.header, c.x, y, { width: c.width, align: c.align, lineBreak: false });
		doc.moveTo(MARGIN, y + 12).lineTo(MARGIN + W, y + 12).lineWidth(0.4).strokeColor('#cbd5e1').stroke();
		doc.y = y + 15;
	};
	/** Room for a row of `height`; on a new page, the table's header again with "(continued)". */
	const rowRoom = (height: number, cols: readonly Column[], title: string) => {
		if (ensure(height)) tableHeader(cols, `${title} (continued)`);
	};

	// ---- dealer and customer
	const top = doc.y;
	let logoW = 0;
	if (settings.logo) {
		try {
			doc.image(settings.logo, MARGIN, top, { fit: [120, 48] });
			logoW = 130;
		} catch {
			logoW = 0; // an unreadable logo never stops a quote
		}
	}
	doc.font('Bold').fontSize(14).fillColor(INK).text(printable(settings.dealerName), MARGIN + logoW, top, { width: W / 2 - logoW });
	doc.font('Body').fontSize(9).fillColor(MUTED).text(printable([settings.dealerAddress, settings.dealerPhone, settings.dealerEmail].filter(Boolean).join('\n')), { width: W / 2 - logoW });
	const leftBottom = doc.y;
	doc.font('Bold').fontSize(18).fillColor(TIDE).text('Quote', MARGIN + W / 2, top, { width: W / 2, align: 'right' });
	doc.font('Semi').fontSize(11).fillColor(INK).text(rev.number, { width: W / 2, align: 'right' });
	doc.font('Body').fontSize(9).fillColor(MUTED).text(
		[`Revision ${rev.revision}`, `Sent ${quoteDate(rev.sentAt, tz)}`, `Valid until ${quoteDate(rev.validUntil, tz)}`, `Prepared by ${printable(view.ownerName)}`].join('\n'),
		{ width: W / 2, align: 'right' }
	);
	doc.y = Math.max(leftBottom, doc.y) + 10;

	heading('Customer and site');
	para(`${view.customerName}${rev.contactName ? ` — attention ${rev.contactName}` : ''}`);
	para([view.siteName, ...view.siteAddress].filter(Boolean).join(', '));
	const op = input.operation;
	para(
		`${input.fleet.trucks} × ${input.truck.name ?? 'truck'} (${input.truck.voltage} V) with ${input.battery.name ?? `${input.battery.capacityAh} Ah ${input.battery.chemistry} battery`}; ` +
			`${op.shiftsPerDay} shift${op.shiftsPerDay === 1 ? '' : 's'} of ${op.hoursPerShift} h, ${op.daysPerWeek} days a week, ${op.energyKwhPerHour} kWh per working hour, ${op.charging} charging.`
	);

	// ---- setup and why it fits (the customer's words: no ranks, no cost comparisons)
	const text = customerSetupText(result, input, setup.id);
	heading(`The setup: ${setup.name}`);
	para(
		`${setup.batteriesPerTruck} batter${setup.batteriesPerTruck === 1 ? 'y' : 'ies'} per truck · ${setup.changesPerTruckPerDay} battery change${setup.changesPerTruckPerDay === 1 ? '' : 's'} per truck a day.`
	);
	doc.moveDown(0.2);
	doc.font('Semi').fontSize(9.5).fillColor(INK).text('Why it fits your site', MARGIN, doc.y, { width: W });
	for (const r of text.why) para(`• ${r}`, { indent: 8 });
	if (text.others.length) {
		doc.moveDown(0.3);
		doc.font('Semi').fontSize(9.5).fillColor(INK).text('Other setups we checked', MARGIN, doc.y, { width: W });
		for (const o of text.others) para(`• ${o.name} ${o.note}`, { indent: 8 });
	}
	if (setup.id !== 'in-truck') {
		para('The latch adapter holds battery and trolley to the pallet truck; without it they would sit loose on the forks while moved.', { oblique: false });
	}

	// ---- checks, by their names (never the engine's codes)
	heading('Compatibility checks');
	const GAP = 6;
	const checkCols: Column[] = (() => {
		const widths = [104, 62, 76, 76];
		const out: Column[] = [];
		let x = MARGIN;
		for (const [i, header] of ['Check', 'Result', 'Measured', 'Limit'].entries()) {
			out.push({ header, x, width: widths[i], align: 'left' });
			x += widths[i] + GAP;
		}
		out.push({ header: 'What it means', x, width: MARGIN + W - x, align: 'left' });
		return out;
	})();
	const checkRow = (c: CustomerCheck) => {
		const cells = [printable(c.name), c.resultLabel, figure(c.measured, c.unit), figure(c.limit, c.unit), printable(c.message + (c.remedy ? ` Remedy: ${c.remedy}` : ''))];
		doc.font('Body').fontSize(8.5);
		const h = Math.max(...cells.map((t, i) => doc.heightOfString(t, { width: checkCols[i].width })), 11) + 5;
		rowRoom(h, checkCols, 'Compatibility checks');
		doc.fontSize(8.5);
		const y = doc.y;
		doc.fillColor(INK).font('Semi').text(cells[0], checkCols[0].x, y, { width: checkCols[0].width });
		doc.fillColor(c.result === 'fail' ? RED : c.result === 'warn' ? EMBER : TIDE).text(cells[1], checkCols[1].x, y, { width: checkCols[1].width });
		doc.fillColor(INK).font('Body');
		for (let i = 2; i < cells.length; i++) doc.text(cells[i], checkCols[i].x, y, { width: checkCols[i].width });
		doc.y = y + h;
	};
	ensure(40);
	tableHeader(checkCols);
	for (const c of text.checks) checkRow(c);

	// ---- drawing
	heading('Side view of the compartment, to scale');
	ensure(250);
	const scene = compartmentScene({
		truck: input.truck,
		battery: input.battery,
		setup: setup.id,
		palletTruck: input.site.palletTrucks[0],
		stand: input.site.rollerStands[0],
		crane: input.site.crane,
		checks: setup.checks
	});
	const dy = doc.y;
	drawCompartmentScene(doc, scene, { x: MARGIN, y: dy, width: W, height: 230, system: 'metric', font: 'Body' });
	doc.y = dy + 236;

	// ---- priced lines: numbers right-aligned under right-aligned headers, each column its own box
	heading('Price');
	const priceCols: Column[] = [
		{ header: 'Item', x: MARGIN, width: 250, align: 'left' },
		{ header: 'Qty', x: MARGIN + 256, width: 40, align: 'right' },
		{ header: 'Unit price', x: MARGIN + 302, width: 82, align: 'right' },
		{ header: 'Discount', x: MARGIN + 390, width: 50, align: 'right' },
		{ header: 'Amount', x: MARGIN + 446, width: W - 446, align: 'right' }
	];
	ensure(40);
	tableHeader(priceCols);
	for (const l of view.lines) {
		const priced = priceLine({ ...l, kind: l.kind as LineKind, noCharge: l.noCharge });
		const cells = [
			printable(`${l.description} (${l.sku})`),
			String(l.quantity),
			l.noCharge ? 'included' : money(l.unitListCents),
			priced.lineDiscountBp > 0 ? formatBp(priced.lineDiscountBp) : '',
			l.noCharge ? money(0) : money(priced.netCents)
		];
		doc.font('Body').fontSize(8.5);
		const h = Math.max(doc.heightOfString(cells[0], { width: priceCols[0].width }), 11) + 4;
		rowRoom(h, priceCols, 'Price');
		const y = doc.y;
		doc.font('Body').fontSize(8.5).fillColor(INK);
		for (const [i, c] of priceCols.entries()) doc.text(cells[i], c.x, y, { width: c.width, align: c.align });
		doc.y = y + h;
	}
	const t = rev.totals;
	const amount = priceCols[4];
	const labelX = MARGIN + 150;
	const totalRow = (label: string, value: string, bold = false) => {
		ensure(14);
		const y = doc.y;
		doc.font(bold ? 'Bold' : 'Body').fontSize(bold ? 10.5 : 9).fillColor(INK).text(label, labelX, y, { width: amount.x - 8 - labelX, align: 'right' });
		doc.text(value, amount.x - 30, y, { width: amount.width + 30, align: 'right' });
		doc.y = y + (bold ? 15 : 12);
	};
	ensure(30);
	doc.moveTo(labelX, doc.y + 2).lineTo(MARGIN + W, doc.y + 2).lineWidth(0.5).strokeColor(MUTED).stroke();
	doc.y += 6;
	totalRow('Subtotal', money(t.subtotalCents));
	if (t.overallDiscountCents > 0) totalRow(`Discount (${formatBp(t.overallDiscountBp)})`, `−${money(t.overallDiscountCents)}`);
	// a tax line only when a rate applies (company settings: a region without a rate gets none)
	if (showsTaxLine(rev)) {
		totalRow('Net before tax', money(t.netBeforeTaxCents));
		totalRow(`Tax${rev.taxLabel ? ` — ${printable(rev.taxLabel)}` : ''} (${formatBp(t.taxRateBp)})`, money(t.taxCents));
	}
	totalRow('Total', money(t.totalCents), true);
	totalRow(`Deposit due on acceptance (${formatBp(t.depositShareBp)})`, money(t.depositCents), true);
	totalRow('Balance due on delivery', money(t.balanceCents));
	doc.moveDown(0.4);
	para(`This quote is valid until ${quoteDate(rev.validUntil, tz)}. Prices from price book ${printable(rev.priceBookLabel)}.`);
	if (rev.notes) {
		heading('Notes');
		para(rev.notes);
	}

	// ---- terms
	if (rev.terms) {
		heading('Terms');
		doc.font('Body').fontSize(8.5).fillColor(INK).text(printable(rev.terms), MARGIN, doc.y, { width: W });
	}

	// ---- safety
	heading('Safety cautions');
	for (const c of result.cautions) {
		ensure(12);
		doc.font('Body').fontSize(8.5).fillColor(INK).text(`• ${printable(c)}`, MARGIN, doc.y, { width: W, indent: 0 });
	}

	// ---- acceptance
	ensure(130);
	heading('Acceptance');
	para(`We accept quote ${rev.number} as set out above, including the deposit of ${money(t.depositCents)} due on acceptance.`);
	doc.moveDown(1.5);
	const ay = doc.y;
	const field = (label: string, x: number, w: number) => {
		doc.moveTo(x, ay + 16).lineTo(x + w, ay + 16).lineWidth(0.5).strokeColor(INK).stroke();
		doc.font('Body').fontSize(8).fillColor(MUTED).text(label, x, ay + 19, { width: w });
	};
	field('Name', MARGIN, 150);
	field('Signature', MARGIN + 170, 170);
	field('Date', MARGIN + 360, W - 360);
	doc.y = ay + 40;
	para('The customer may also accept online through the private link sent with this quote.');

	// ---- page furniture on every page
	const range = doc.bufferedPageRange();
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		const bottom = doc.page.height - MARGIN + 4;
		doc.page.margins.bottom = 0;
		doc.font('Body').fontSize(8).fillColor(MUTED);
		doc.text(`${rev.number} · revision ${rev.revision}`, MARGIN, bottom, { width: W / 2, lineBreak: false });
		doc.text(`Page ${i - range.start + 1} of ${range.count}`, MARGIN + W / 2, bottom, { width: W / 2, align: 'right', lineBreak: false });
	}
	doc.end();
	return done;
}
