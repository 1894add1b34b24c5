/**
 * What people read for the engine's check codes and results: the customer's page and the PDF name
 * a check "Fit in the compartment — height", never `compartment-fit`, and a result "Passes",
 * never `pass`. Pure; shared by pages and the PDF.
 */

const CHECK_NAMES: Readonly<Record<string, string>> = {
	voltage: 'Battery voltage',
	'battery-weight': 'Battery weight',
	'compartment-fit': 'Fit in the compartment',
	'fork-length': 'Fork length',
	'fork-width': 'Width over the forks',
	'roller-height': 'Roller height',
	'door-swing': 'Compartment door opening angle',
	'handling-capacity': 'Lifting capacity',
	'floor-space': 'Charging floor space',
	ventilation: 'Charging-area ventilation',
	duty: 'Run time over the working day'
};

const SUBJECT_NAMES: Readonly<Record<string, string>> = {
	length: 'length',
	width: 'width',
	height: 'height',
	play: 'side play',
	'pallet-truck': 'pallet truck',
	'roller-stand': 'roller stand',
	'lifting-beam': 'lifting beam',
	hoist: 'overhead hoist'
};

/** "Fit in the compartment — height" for `{ code: 'compartment-fit', subject: 'height' }`. */
export function checkName(check: { code: string; subject?: string }): string {
	const base = CHECK_NAMES[check.code] ?? sentenceCase(check.code.replace(/-/g, ' '));
	const subject = check.subject ? (SUBJECT_NAMES[check.subject] ?? check.subject.replace(/-/g, ' ')) : '';
	return subject ? `${base} — ${subject}` : base;
}

/**
 * The result in words: a pass "Passes", a warning "Check on site", a failure that an order or a site
 * change resolves "Needs a change", one that nothing resolves "Does not fit".
 */
export function checkResultLabel(check: { result: string; fixable?: boolean }): string {
	if (check.result === 'pass') return 'Passes';
	if (check.result === 'warn') return 'Check on site';
	if (check.result === 'fail') return check.fixable === false ? 'Does not fit' : 'Needs a change';
	return sentenceCase(check.result);
}

function sentenceCase(s: string): string {
	return s.charAt(0).toUpperCase() + s.slice(1);
}
