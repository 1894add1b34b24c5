import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { SurveyDraft, keptValues, refusedFields } from './draft.svelte';

const ID = '9d6f2e3c-5a71-4293-8e1f-3a4b5c6d7e8f';

type Reply = { status: number; body: unknown };
/** A fetch stand-in answering each PATCH with the next reply, and recording what was sent. */
function fakeServer(replies: Reply[]) {
	const sent: { step: string; values: Record<string, unknown> }[] = [];
	const fetchMock = vi.fn(async (_url: string, init?: RequestInit) => {
		const body = JSON.parse(String(init?.body ?? '{}'));
		if (init?.method === 'PATCH') sent.push(body);
		const reply = replies.shift() ?? { status: 200, body: { version: 99, updatedAt: '2026-12-02T05:00:00.000Z' } };
		return new Response(JSON.stringify(reply.body), { status: reply.status, headers: { 'content-type': 'application/json' } });
	});
	vi.stubGlobal('fetch', fetchMock);
	return { sent, fetchMock };
}

const partialRefusal: Reply = {
	status: 400,
	body: {
		message: 'One answer was not saved: fix it as its message says. The other answers of this step were saved.',
		errors: { 'values.contactEmail': ['Enter a valid e-mail address, like name@example.com (or leave it empty).'] },
		version: 4,
		updatedAt: '2026-12-02T04:49:00.000Z'
	}
};

beforeEach(() => {
	vi.useFakeTimers();
});
afterEach(() => {
	vi.useRealTimers();
	vi.unstubAllGlobals();
});

describe('autosave when the server refuses one answer', () => {
	it('never says "saved": it marks the field, keeps the rest as saved and does not retry', async () => {
		const { sent } = fakeServer([partialRefusal]);
		const draft = new SurveyDraft(ID, { site: { contactName: 'Old name' } }, 3, '2026-12-02T04:40:00.000Z');
		draft.update('site', { contactName: 'Dale Prentice', contactPhone: '+1 555 0100 222', contactEmail: 'dale@pellham' }, { evaluate: false });
		expect(draft.saveState).toBe('unsaved');
		expect(await draft.flush()).toBe(true);

		expect(sent).toHaveLength(1);
		expect(draft.saveState).toBe('refused');
		expect(draft.refusedCount).toBe(1);
		expect(draft.fieldError('site', 'contactEmail')).toMatch(/name@example\.com/);
		expect(draft.fieldError('site', 'contactPhone')).toBeNull();
		// the server stored the rest: its new version is taken
		expect(draft.version).toBe(4);
		// something typed is not on the server: leaving must warn
		expect(draft.hasUnsaved).toBe(true);
		expect(draft.hasPending).toBe(false);
		// a refusal is not a network failure: nothing is sent again by itself
		await vi.advanceTimersByTimeAsync(60_000);
		expect(sent).toHaveLength(1);
	});

	it('clears the mark once the rep corrects the answer and the server takes it', async () => {
		const { sent } = fakeServer([partialRefusal, { status: 200, body: { version: 5, updatedAt: '2026-12-02T04:50:00.000Z' } }]);
		const draft = new SurveyDraft(ID, {}, 3, '2026-12-02T04:40:00.000Z');
		draft.update('site', { contactName: 'Dale Prentice', contactEmail: 'dale@pellham' }, { evaluate: false });
		await draft.flush();
		draft.update('site', { contactName: 'Dale Prentice', contactEmail: 'dale@pellham.example' }, { evaluate: false });
		await draft.flush();
		expect(sent[1].values.contactEmail).toBe('dale@pellham.example');
		expect(draft.saveState).toBe('saved');
		expect(draft.refusedCount).toBe(0);
		expect(draft.hasUnsaved).toBe(false);
		expect(draft.version).toBe(5);
	});

	it('a later save of another step does not clear a refusal on this one', async () => {
		fakeServer([partialRefusal, { status: 200, body: { version: 5, updatedAt: '2026-12-02T04:50:00.000Z' } }]);
		const draft = new SurveyDraft(ID, {}, 3, '2026-12-02T04:40:00.000Z');
		draft.update('site', { contactEmail: 'dale@pellham' }, { evaluate: false });
		await draft.flush();
		draft.update('notes', { notes: 'Hoist over bay 2' }, { evaluate: false });
		await draft.flush();
		expect(draft.saveState).toBe('refused');
		expect(draft.fieldError('site', 'contactEmail')).not.toBeNull();
	});

	it('leaving anyway puts the refused answer back to what the server holds', async () => {
		fakeServer([partialRefusal]);
		const draft = new SurveyDraft(ID, { site: { contactEmail: 'dale@pellham.example' } }, 3, '2026-12-02T04:40:00.000Z');
		draft.update('site', { contactName: 'Dale Prentice', contactEmail: 'dale@pellham' }, { evaluate: false });
		await draft.flush();
		draft.discardRefused();
		expect(draft.data.site).toEqual({ contactName: 'Dale Prentice', contactEmail: 'dale@pellham.example' });
		expect(draft.saveState).toBe('saved');
		expect(draft.hasUnsaved).toBe(false);
	});

	it('a network failure is still retried, and says so', async () => {
		const { fetchMock } = fakeServer([]);
		fetchMock.mockRejectedValueOnce(new TypeError('offline'));
		const draft = new SurveyDraft(ID, {}, 3, '2026-12-02T04:40:00.000Z');
		draft.update('notes', { notes: 'x' }, { evaluate: false });
		expect(await draft.flush()).toBe(false);
		expect(draft.saveState).toBe('unsaved');
		expect(draft.retrying).toBe(true);
		await vi.advanceTimersByTimeAsync(1_500);
		expect(draft.saveState).toBe('saved');
	});

	it('takes the survey a page brings (after Next) without losing what is still refused', async () => {
		fakeServer([partialRefusal]);
		const draft = new SurveyDraft(ID, {}, 3, '2026-12-02T04:40:00.000Z');
		draft.update('site', { contactName: 'Dale Prentice', contactEmail: 'dale@pellham' }, { evaluate: false });
		await draft.flush();
		draft.adopt({ site: { contactName: 'Dale Prentice' }, equipment: { palletTrucks: [], rollerStands: [] } }, 6, '2026-12-02T04:51:00.000Z');
		expect(draft.data.equipment).toEqual({ palletTrucks: [], rollerStands: [] });
		expect(draft.data.site).toEqual({ contactName: 'Dale Prentice', contactEmail: 'dale@pellham' });
		expect(draft.version).toBe(6);
	});
});

describe('live panel', () => {
	it('lists what the engine refused by the wizard’s labels, not internal keys; asks in the rep’s units', async () => {
		const { fetchMock } = fakeServer([{ status: 400, body: { message: 'Some fields are missing or out of range.', errors: { 'operation.hoursPerShift': ['Too long.'] } } }]);
		const draft = new SurveyDraft(
			ID,
			{
				fleet: { truckModelId: 'a', trucks: 4, batterySource: 'catalogue', batteryId: 'b' },
				operation: { shiftsPerDay: 4, hoursPerShift: 12, daysPerWeek: 5, energyKwhPerHour: 5, charging: 'fast', duty: 'heavy' }
			},
			3,
			'2026-12-02T04:40:00.000Z',
			'imperial'
		);
		await draft.evaluate();
		expect(draft.liveState).toBe('incomplete');
		expect(draft.missing).toEqual(['Hours per shift — Too long']);
		const [url, init] = fetchMock.mock.calls[0];
		expect(url).toBe('/api/v1/evaluate');
		expect(JSON.parse(String(init?.body)).units).toBe('imperial');
	});
});

describe('reading the server’s refusal', () => {
	it('takes field paths from "values.<path>" keys only', () => {
		expect(refusedFields({ 'values.contactEmail': ['Bad.'], 'values.palletTrucks.0.forkLengthMm': ['Long.'], step: ['x'] })).toEqual({
			contactEmail: 'Bad.',
			'palletTrucks.0.forkLengthMm': 'Long.'
		});
		expect(refusedFields(undefined)).toEqual({});
	});

	it('knows what the server kept of what was sent', () => {
		const sent = { contactName: 'Dale', contactEmail: 'dale@pellham', palletTrucks: [{ forkLengthMm: 99_999, overallWidthMm: 540 }], rollerStands: [5] };
		expect(keptValues(sent, ['contactEmail', 'palletTrucks.0.forkLengthMm', 'rollerStands.0'])).toEqual({
			contactName: 'Dale',
			palletTrucks: [{ forkLengthMm: null, overallWidthMm: 540 }]
		});
	});
});
