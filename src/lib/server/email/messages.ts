/**
 * Builders for every message Traywise sends. Plain functions: data in, `{ subject, text, html,
 * attachments }` out, no I/O. Every value that a person typed (names, comments, reasons) goes
 * through `userHtml` in HTML and `cleanText` / `cleanLine` in text and subjects; amounts are integer
 * cents formatted with Intl.NumberFormat.
 */
import { cleanLine, cleanText, escapeHtml, formatDate, formatDateTime, formatMoney, userHtml } from './format';

export interface MailAttachment {
	filename: string;
	contentType: string;
	content: Buffer;
}

export interface BuiltMessage {
	subject: string;
	text: string;
	html: string;
	attachments: MailAttachment[];
}

/** How dates and money are shown to the recipient. */
export interface Presentation {
	/** BCP 47 locale, default en-US */
	locale?: string;
	/** IANA time zone for times, default UTC */
	timeZone?: string;
}

export interface QuoteToCustomerInput extends Presentation {
	dealerName: string;
	quoteNumber: string;
	/** 1 for the first revision sent */
	revision: number;
	customerName: string;
	contactName: string;
	repName: string;
	repEmail: string;
	totalCents: number;
	depositCents: number;
	/** ISO 4217, e.g. "EUR" */
	currency: string;
	/** ISO date the quote is valid until */
	validUntil: string;
	/** the customer's private page for this revision */
	link: string;
	pdf: { filename: string; content: Buffer };
}

export interface ApprovalRequestInput extends Presentation {
	quoteNumber: string;
	customerName: string;
	repName: string;
	managerName: string;
	totalCents: number;
	currency: string;
	/** why approval is needed, e.g. "Line discount 18 % exceeds the rep's 10 %" */
	reasons: string[];
	/** the quote in the app */
	link: string;
}

export interface ApprovalDecisionInput extends Presentation {
	quoteNumber: string;
	customerName: string;
	repName: string;
	managerName: string;
	decision: 'approved' | 'changes-requested';
	comment?: string | null;
	link: string;
}

export interface AcceptanceReceiptInput extends Presentation {
	audience: 'customer' | 'rep';
	dealerName: string;
	quoteNumber: string;
	customerName: string;
	/** whom the message greets */
	recipientName: string;
	/** the full name the customer typed when accepting */
	acceptedByName: string;
	acceptedAt: string | Date;
	totalCents: number;
	depositCents: number;
	currency: string;
	/** customer: their quote page (where the deposit is paid); rep: the quote in the app */
	link: string;
	repName: string;
}

export interface DepositReceiptInput extends Presentation {
	audience: 'customer' | 'rep';
	dealerName: string;
	quoteNumber: string;
	customerName: string;
	recipientName: string;
	amountCents: number;
	currency: string;
	paidAt: string | Date;
	/** the payment provider's reference for the payment */
	paymentReference: string;
	link: string;
	repName: string;
}

export interface PasswordResetInput {
	userName: string;
	link: string;
	expiresInMinutes: number;
}

/** Refuses anything but an absolute http(s) address: links in mail are always ours. */
function safeLink(link: string): string {
	const url = new URL(link);
	if (url.protocol !== 'https:' && url.protocol !== 'http:') throw new Error(`refusing a ${url.protocol} link in mail`);
	return url.toString();
}

const COLORS = { ink: '#0f172a', muted: '#475569', line: '#e2e8f0', action: '#1c605d', page: '#f1f5f9' };

function button(href: string, label: string): string {
	return `<p style="margin:24px 0"><a href="${escapeHtml(href)}" style="display:inline-block;background:${COLORS.action};color:#ffffff;text-decoration:none;font-weight:600;padding:12px 20px;border-radius:8px">${escapeHtml(label)}</a></p>
<p style="margin:0 0 16px;font-size:13px;color:${COLORS.muted}">Or copy this address into your browser:<br><span style="word-break:break-all">${escapeHtml(href)}</span></p>`;
}

function facts(rows: [string, string][]): string {
	const cells = rows
		.map(
			([label, value]) =>
				`<tr><td style="padding:6px 12px 6px 0;color:${COLORS.muted};white-space:nowrap;vertical-align:top">${escapeHtml(label)}</td><td style="padding:6px 0;font-weight:600">${value}</td></tr>`
		)
		.join('');
	return `<table role="presentation" style="border-collapse:collapse;margin:16px 0">${cells}</table>`;
}

function factsText(rows: [string, string][]): string {
	const width = Math.max(...rows.map(([label]) => label.length));
	return rows.map(([label, value]) => `${(label + ':').padEnd(width + 2)}${value}`).join('\n');
}

/** The shared frame: a white card on a light page, our own plain look. */
function layout(subject: string, body: string, footer: string): string {
	return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(subject)}</title></head>
<body style="margin:0;padding:0;background:${COLORS.page};font-family:Inter,Segoe UI,Helvetica,Arial,sans-serif;color:${COLORS.ink};font-size:15px;line-height:1.5">
<div style="max-width:560px;margin:0 auto;padding:24px 16px">
<div style="background:#ffffff;border:1px solid ${COLORS.line};border-radius:12px;padding:24px">
${body}
</div>
<p style="margin:16px 4px;font-size:12px;color:${COLORS.muted}">${footer}</p>
</div>
</body>
</html>`;
}

function paragraph(html: string): string {
	return `<p style="margin:0 0 12px">${html}</p>`;
}

/** The quote e-mailed to the customer: the private link and the PDF attached. */
export function quoteToCustomer(input: QuoteToCustomerInput): BuiltMessage {
	const { locale, timeZone } = input;
	const link = safeLink(input.link);
	const revision = input.revision > 1 ? ` (revision ${input.revision})` : '';
	const subject = cleanLine(`Your quote ${input.quoteNumber}${revision} from ${input.dealerName}`);
	const total = formatMoney(input.totalCents, input.currency, locale);
	const deposit = formatMoney(input.depositCents, input.currency, locale);
	const valid = formatDate(input.validUntil, locale, timeZone);
	const rows: [string, string][] = [
		['Quote', `${input.quoteNumber}${revision}`],
		['Total', total],
		['Deposit to confirm', deposit],
		['Valid until', valid]
	];
	const text = `Hello ${cleanText(input.contactName)},

${cleanText(input.repName)} at ${cleanText(input.dealerName)} has prepared a quote for ${cleanText(input.customerName)}.

${factsText(rows)}

Read the quote, download it and accept it on your private page:
${link}

The quote is attached as a PDF as well. The link is meant for you; please do not forward it.

Questions? Reply to this message or write to ${cleanText(input.repName)} at ${cleanText(input.repEmail)}.
`;
	const html = layout(
		subject,
		`<h1 style="margin:0 0 16px;font-size:20px">Your quote from ${userHtml(input.dealerName)}</h1>
${paragraph(`Hello ${userHtml(input.contactName)},`)}
${paragraph(`${userHtml(input.repName)} at ${userHtml(input.dealerName)} has prepared a quote for ${userHtml(input.customerName)}.`)}
${facts(rows.map(([l, v]) => [l, escapeHtml(v)]))}
${button(link, 'Open your quote')}
${paragraph('The quote is attached as a PDF as well. The link is meant for you; please do not forward it.')}
${paragraph(`Questions? Reply to this message or write to ${userHtml(input.repName)} at ${userHtml(input.repEmail)}.`)}`,
		`Sent by Traywise on behalf of ${userHtml(input.dealerName)}.`
	);
	return {
		subject,
		text,
		html,
		attachments: [{ filename: cleanLine(input.pdf.filename), contentType: 'application/pdf', content: input.pdf.content }]
	};
}

/** To a sales manager: a quote needs their decision before it can be sent. */
export function approvalRequest(input: ApprovalRequestInput): BuiltMessage {
	const link = safeLink(input.link);
	const subject = cleanLine(`Approval needed: quote ${input.quoteNumber} for ${input.customerName}`);
	const total = formatMoney(input.totalCents, input.currency, input.locale);
	const reasonsText = input.reasons.map((r) => `- ${cleanText(r)}`).join('\n');
	const text = `Hello ${cleanText(input.managerName)},

${cleanText(input.repName)} asks you to approve quote ${input.quoteNumber} for ${cleanText(input.customerName)} (total ${total}).

It needs your decision because:
${reasonsText}

Approve it or send it back with a comment:
${link}
`;
	const reasonsHtml = input.reasons.map((r) => `<li style="margin:0 0 4px">${userHtml(r)}</li>`).join('');
	const html = layout(
		subject,
		`<h1 style="margin:0 0 16px;font-size:20px">A quote needs your approval</h1>
${paragraph(`Hello ${userHtml(input.managerName)},`)}
${paragraph(`${userHtml(input.repName)} asks you to approve quote ${escapeHtml(input.quoteNumber)} for ${userHtml(input.customerName)} (total ${escapeHtml(total)}).`)}
${paragraph('It needs your decision because:')}
<ul style="margin:0 0 12px;padding-left:20px">${reasonsHtml}</ul>
${button(link, 'Review the quote')}`,
		'Traywise approvals. You receive this because you approve quotes for your team.'
	);
	return { subject, text, html, attachments: [] };
}

/** To the rep: the manager approved the quote or sent it back. */
export function approvalDecision(input: ApprovalDecisionInput): BuiltMessage {
	const link = safeLink(input.link);
	const approved = input.decision === 'approved';
	const subject = cleanLine(
		approved
			? `Quote ${input.quoteNumber} approved`
			: `Quote ${input.quoteNumber}: changes requested`
	);
	const verdict = approved
		? 'approved it; you can now send it to the customer.'
		: 'sent it back with changes requested.';
	const comment = input.comment?.trim() ? input.comment.trim() : null;
	const text = `Hello ${cleanText(input.repName)},

${cleanText(input.managerName)} reviewed quote ${input.quoteNumber} for ${cleanText(input.customerName)} and ${verdict}
${comment ? `\nComment:\n${cleanText(comment)}\n` : ''}
Open the quote:
${link}
`;
	const html = layout(
		subject,
		`<h1 style="margin:0 0 16px;font-size:20px">${approved ? 'Quote approved' : 'Changes requested'}</h1>
${paragraph(`Hello ${userHtml(input.repName)},`)}
${paragraph(`${userHtml(input.managerName)} reviewed quote ${escapeHtml(input.quoteNumber)} for ${userHtml(input.customerName)} and ${escapeHtml(verdict)}`)}
${comment ? `<blockquote style="margin:0 0 12px;padding:8px 12px;border-left:4px solid ${COLORS.line};white-space:pre-wrap">${userHtml(comment)}</blockquote>` : ''}
${button(link, 'Open the quote')}`,
		'Traywise approvals.'
	);
	return { subject, text, html, attachments: [] };
}

/** After the customer accepts: a receipt to the customer (with the way to the deposit) or the rep. */
export function acceptanceReceipt(input: AcceptanceReceiptInput): BuiltMessage {
	const { locale, timeZone } = input;
	const link = safeLink(input.link);
	const when = formatDateTime(input.acceptedAt, locale, timeZone);
	const total = formatMoney(input.totalCents, input.currency, locale);
	const deposit = formatMoney(input.depositCents, input.currency, locale);
	const rows: [string, string][] = [
		['Quote', input.quoteNumber],
		['Accepted by', cleanText(input.acceptedByName)],
		['Accepted at', when],
		['Total', total],
		['Deposit', deposit]
	];
	const htmlRows: [string, string][] = rows.map(([l, v], i) => [l, i === 1 ? userHtml(input.acceptedByName) : escapeHtml(v)]);
	const forCustomer = input.audience === 'customer';
	const subject = cleanLine(
		forCustomer
			? `We have your acceptance of quote ${input.quoteNumber}`
			: `${input.customerName} accepted quote ${input.quoteNumber}`
	);
	const lead = forCustomer
		? `Thank you. ${cleanText(input.dealerName)} has your acceptance of quote ${input.quoteNumber}. The order is confirmed once the deposit is paid.`
		: `${cleanText(input.customerName)} accepted quote ${input.quoteNumber}. The deposit is not paid yet.`;
	const leadHtml = forCustomer
		? `Thank you. ${userHtml(input.dealerName)} has your acceptance of quote ${escapeHtml(input.quoteNumber)}. The order is confirmed once the deposit is paid.`
		: `${userHtml(input.customerName)} accepted quote ${escapeHtml(input.quoteNumber)}. The deposit is not paid yet.`;
	const action = forCustomer ? 'Pay the deposit' : 'Open the quote';
	const text = `Hello ${cleanText(input.recipientName)},

${lead}

${factsText(rows)}

${action}:
${link}
${forCustomer ? `\nYour contact: ${cleanText(input.repName)}, ${cleanText(input.dealerName)}.\n` : ''}`;
	const html = layout(
		subject,
		`<h1 style="margin:0 0 16px;font-size:20px">${forCustomer ? 'Quote accepted' : 'A customer accepted a quote'}</h1>
${paragraph(`Hello ${userHtml(input.recipientName)},`)}
${paragraph(leadHtml)}
${facts(htmlRows)}
${button(link, action)}
${forCustomer ? paragraph(`Your contact: ${userHtml(input.repName)}, ${userHtml(input.dealerName)}.`) : ''}`,
		forCustomer ? `Sent by Traywise on behalf of ${userHtml(input.dealerName)}.` : 'Traywise delivery trail.'
	);
	return { subject, text, html, attachments: [] };
}

/** After the payment provider confirms the deposit: a receipt to the customer or the rep. */
export function depositReceipt(input: DepositReceiptInput): BuiltMessage {
	const { locale, timeZone } = input;
	const link = safeLink(input.link);
	const amount = formatMoney(input.amountCents, input.currency, locale);
	const when = formatDateTime(input.paidAt, locale, timeZone);
	const rows: [string, string][] = [
		['Quote', input.quoteNumber],
		['Deposit paid', amount],
		['Paid at', when],
		['Payment reference', cleanText(input.paymentReference)]
	];
	const forCustomer = input.audience === 'customer';
	const subject = cleanLine(
		forCustomer
			? `Deposit received for quote ${input.quoteNumber}`
			: `Deposit paid: ${input.customerName}, quote ${input.quoteNumber}`
	);
	const lead = forCustomer
		? `Thank you. We received your deposit of ${amount} for quote ${input.quoteNumber}; your order is confirmed.`
		: `${cleanText(input.customerName)} paid the deposit of ${amount} for quote ${input.quoteNumber}.`;
	const leadHtml = forCustomer
		? `Thank you. We received your deposit of ${escapeHtml(amount)} for quote ${escapeHtml(input.quoteNumber)}; your order is confirmed.`
		: `${userHtml(input.customerName)} paid the deposit of ${escapeHtml(amount)} for quote ${escapeHtml(input.quoteNumber)}.`;
	const text = `Hello ${cleanText(input.recipientName)},

${lead}

${factsText(rows)}

${forCustomer ? 'Your quote' : 'Open the quote'}:
${link}
${forCustomer ? `\nYour contact: ${cleanText(input.repName)}, ${cleanText(input.dealerName)}. Keep this message as your receipt.\n` : ''}`;
	const html = layout(
		subject,
		`<h1 style="margin:0 0 16px;font-size:20px">Deposit received</h1>
${paragraph(`Hello ${userHtml(input.recipientName)},`)}
${paragraph(leadHtml)}
${facts(rows.map(([l, v], i) => [l, i === 3 ? userHtml(input.paymentReference) : escapeHtml(v)]))}
${button(link, forCustomer ? 'Your quote' : 'Open the quote')}
${forCustomer ? paragraph(`Your contact: ${userHtml(input.repName)}, ${userHtml(input.dealerName)}. Keep this message as your receipt.`) : ''}`,
		forCustomer ? `Sent by Traywise on behalf of ${userHtml(input.dealerName)}.` : 'Traywise delivery trail.'
	);
	return { subject, text, html, attachments: [] };
}

/** A link to choose a new password; says plainly what to do when the request was not theirs. */
export function passwordReset(input: PasswordResetInput): BuiltMessage {
	const link = safeLink(input.link);
	const subject = 'Choose a new Traywise password';
	const text = `Hello ${cleanText(input.userName)},

Someone (we hope you) asked to choose a new password for your Traywise account. This link works once, for the next ${input.expiresInMinutes} minutes:
${link}

If you did not ask for this, ignore this message: your password stays as it is.
`;
	const html = layout(
		subject,
		`<h1 style="margin:0 0 16px;font-size:20px">Choose a new password</h1>
${paragraph(`Hello ${userHtml(input.userName)},`)}
${paragraph(`Someone (we hope you) asked to choose a new password for your Traywise account. This link works once, for the next ${escapeHtml(String(input.expiresInMinutes))} minutes.`)}
${button(link, 'Choose a new password')}
${paragraph('If you did not ask for this, ignore this message: your password stays as it is.')}`,
		'Traywise account security.'
	);
	return { subject, text, html, attachments: [] };
}
