/**
 * The catalogue admin's form actions and answers, shared by the truck model, battery and equipment
 * pages so that each reads, stores, retires and deletes the same way and says the same thing.
 * Each kind of entry is described once below: its words, its form and its repository functions.
 */
import { error, fail, redirect, type RequestEvent } from '@sveltejs/kit';
import { message, setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4, type ValidationAdapter } from 'sveltekit-superforms/adapters';
import * as forms from '$lib/schemas/catalogue';
import type { ReadResult } from '$lib/schemas/catalogue';
import type { UnitSystem } from '$lib/units';
import { requirePermission } from './auth/guard';
import * as repo from './repositories/catalogue';
import type { CatalogueDeleteOutcome, CatalogueSaveOutcome } from './repositories/catalogue';

type Refused = Exclude<CatalogueSaveOutcome<unknown>, { ok: true }>;

export interface EntryWords {
	/** "truck model", "battery", "equipment item" */
	noun: string;
	/** form field of the unique code: 'code' or 'sku' */
	codeField: 'code' | 'sku';
	/** "code" or "SKU" */
	codeNoun: string;
	/** the list page, which names an entry just deleted */
	listHref: string;
	/** what Retire and Restore answer */
	retired: string;
	restored: string;
}

/** One kind of catalogue entry: what its pages say, its form, and its repository functions. */
export interface EntryKind<
	T extends Record<string, unknown>,
	In extends Record<string, unknown>,
	Input,
	Row extends { id: string; name: string; retired: boolean }
> extends EntryWords {
	adapter: ValidationAdapter<T, In>;
	read: (form: T) => ReadResult<Input>;
	/** a stored entry as the text of its form, in the user's unit system */
	values: (row: Row, system: UnitSystem) => Partial<In>;
	/** the entry's code or SKU */
	code: (row: Row) => string;
	find: (id: string) => Promise<Row | null>;
	create: (input: Input) => Promise<CatalogueSaveOutcome<Row>>;
	update: (id: string, input: Input) => Promise<CatalogueSaveOutcome<Row>>;
	retire: (id: string) => Promise<boolean>;
	restore: (id: string) => Promise<boolean>;
	remove: (id: string) => Promise<CatalogueDeleteOutcome>;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

type EntryEvent = Pick<RequestEvent<{ id: string }>, 'locals' | 'url' | 'params' | 'request'>;

/** The pages' server side for one kind of entry: its forms and its form actions. */
export class CatalogueKind<
	T extends Record<string, unknown>,
	In extends Record<string, unknown>,
	Input,
	Row extends { id: string; name: string; retired: boolean }
> {
	constructor(readonly kind: EntryKind<T, In, Input, Row>) {}

	get adapter() {
		return this.kind.adapter;
	}

	/** What an entry's page shows of it besides its form. */
	entry(row: Row) {
		return { id: row.id, code: this.kind.code(row), name: row.name, retired: row.retired };
	}

	/** A stored entry as its form, for a page to show. */
	form(row: Row, system: UnitSystem) {
		return superValidate(this.kind.values(row, system), this.kind.adapter, { errors: false });
	}

	/**
	 * "?from=<id>" on an "add" page: the form of that entry to start from, without its code and
	 * with its name marked as a copy, and the code it was copied from. Null without a known id.
	 */
	async copyOf(url: URL, system: UnitSystem) {
		const { kind } = this;
		const from = url.searchParams.get('from');
		const source = from && UUID.test(from) ? await kind.find(from) : null;
		if (!source) return null;
		const values = {
			...kind.values(source, system),
			[kind.codeField]: '',
			name: `${source.name} (copy)`
		} as Partial<In>;
		return { values, code: kind.code(source) };
	}

	/** The "add" page's action: stores the new entry and opens its page, or answers why not. */
	createAction() {
		const { kind } = this;
		return async (event: Pick<RequestEvent, 'locals' | 'url' | 'request'>) => {
			requirePermission(event, 'admin:catalogue');
			const stored = await this.storePosted(event.request, kind.create);
			if (!stored.ok) return stored.answer;
			redirect(303, `${kind.listHref}/${stored.row.id}?created=1`);
		};
	}

	/**
	 * An entry page's actions. Save answers the stored values, as they will read from now on;
	 * Retire and Restore answer `done`; Delete goes back to the list, or answers why it cannot.
	 */
	entryActions() {
		const { kind } = this;
		const missing = `No ${kind.noun} with this id.`;
		return {
			save: async (event: EntryEvent) => {
				const user = requirePermission(event, 'admin:catalogue');
				const stored = await this.storePosted(event.request, (input) =>
					kind.update(event.params.id, input)
				);
				if (!stored.ok) return stored.answer;
				const saved = await this.form(stored.row, user.unitSystem);
				return message(saved, `Saved ${kind.code(stored.row)}.`);
			},
			retire: async (event: EntryEvent) => {
				requirePermission(event, 'admin:catalogue');
				if (!(await kind.retire(event.params.id))) error(404, missing);
				return { done: kind.retired };
			},
			restore: async (event: EntryEvent) => {
				requirePermission(event, 'admin:catalogue');
				if (!(await kind.restore(event.params.id))) error(404, missing);
				return { done: kind.restored };
			},
			delete: async (event: EntryEvent) => {
				requirePermission(event, 'admin:catalogue');
				const row = await kind.find(event.params.id);
				if (!row) error(404, missing);
				const outcome = await kind.remove(row.id);
				if (!outcome.ok) return refusedDelete(outcome, kind.code(row), kind);
				redirect(303, `${kind.listHref}?deleted=${encodeURIComponent(outcome.code)}`);
			}
		};
	}

	/**
	 * Reads a posted form and hands what it read to `store` (a create or an update). Gives the
	 * stored row, or the answer to send back: the form with its field errors (400), or the refusal.
	 */
	private async storePosted(
		request: Request,
		store: (input: Input) => Promise<CatalogueSaveOutcome<Row>>
	) {
		const form = await superValidate(request, this.kind.adapter);
		if (!form.valid) return { ok: false as const, answer: fail(400, { form }) };
		const reading = this.kind.read(form.data);
		if (!reading.ok) return { ok: false as const, answer: fail(400, { form }) };
		const outcome = await store(reading.value);
		if (!outcome.ok) return { ok: false as const, answer: refusedSave(form, outcome, this.kind) };
		return { ok: true as const, row: outcome.row };
	}
}

export const TRUCKS = new CatalogueKind({
	noun: 'truck model',
	codeField: 'code',
	codeNoun: 'code',
	listHref: '/admin/catalogue/trucks',
	retired: 'Retired: new surveys no longer offer this model; surveys that use it keep it.',
	restored: 'Restored: new surveys offer this model again.',
	adapter: zod4(forms.truckFormSchema),
	read: forms.readTruckForm,
	values: forms.truckFormValues,
	code: (truck) => truck.code,
	find: repo.findTruckModel,
	create: repo.createTruckModel,
	update: repo.updateTruckModel,
	retire: repo.retireTruckModel,
	restore: repo.restoreTruckModel,
	remove: repo.deleteTruckModel
});

export const BATTERIES = new CatalogueKind({
	noun: 'battery',
	codeField: 'code',
	codeNoun: 'code',
	listHref: '/admin/catalogue/batteries',
	retired: 'Retired: new surveys no longer offer this battery; surveys that use it keep it.',
	restored: 'Restored: new surveys offer this battery again.',
	adapter: zod4(forms.batteryFormSchema),
	read: forms.readBatteryForm,
	values: forms.batteryFormValues,
	code: (battery) => battery.code,
	find: repo.findBattery,
	create: repo.createBattery,
	update: repo.updateBattery,
	retire: repo.retireBattery,
	restore: repo.restoreBattery,
	remove: repo.deleteBattery
});

export const EQUIPMENT = new CatalogueKind({
	noun: 'equipment item',
	codeField: 'sku',
	codeNoun: 'SKU',
	listHref: '/admin/catalogue/equipment',
	retired: 'Retired: the engine no longer picks this item; quotes that list it keep it.',
	restored: 'Restored: the engine can pick this item again.',
	adapter: zod4(forms.equipmentFormSchema),
	read: forms.readEquipmentForm,
	values: forms.equipmentFormValues,
	code: (item) => item.sku,
	find: repo.findEquipment,
	create: repo.createEquipment,
	update: repo.updateEquipment,
	retire: repo.retireEquipment,
	restore: repo.restoreEquipment,
	remove: repo.deleteEquipment
});

const LIST_STATUSES = ['all', 'active', 'retired'] as const;

/** The list pages' query: which entries to show (`status`) and the code of one just deleted. */
export function listQuery(q: URLSearchParams) {
	const status = LIST_STATUSES.find((s) => s === q.get('status')) ?? 'all';
	return {
		status,
		deleted: q.get('deleted')?.slice(0, 60) ?? null,
		shown: (entry: { retired: boolean }) =>
			status === 'all' ? true : status === 'retired' ? entry.retired : !entry.retired
	};
}

/** A refused save as field errors on the form (400), or a form-level error (404) when it is gone. */
export function refusedSave<T extends Record<string, unknown>>(
	form: SuperValidated<T>,
	outcome: Refused,
	words: EntryWords
) {
	const f = form as unknown as SuperValidated<Record<string, unknown>>;
	switch (outcome.reason) {
		case 'duplicate':
			return setError(
				f,
				words.codeField as never,
				`Another ${words.noun} already has the ${words.codeNoun} “${outcome.code}”. Each ${words.codeNoun} must be unique; nothing was saved.`
			);
		case 'unknown-batteries':
			return setError(
				f,
				'batteryIds' as never,
				'Some of the chosen batteries are no longer in the catalogue. Reload the page and choose again.'
			);
		case 'battery-voltage':
			return setError(
				f,
				'batteryIds' as never,
				`${outcome.codes.join(', ')} ${outcome.codes.length === 1 ? 'has' : 'have'} a different voltage from this truck; a truck takes only batteries of its own voltage.`
			);
		case 'not-found':
			return setError(
				f,
				'',
				`This ${words.noun} is no longer in the catalogue; nothing was saved.`,
				{
					status: 404
				}
			);
	}
}

/** A refused delete: 404 when it is gone, 409 with a message suggesting Retire when it is in use. */
export function refusedDelete(
	outcome: Exclude<CatalogueDeleteOutcome, { ok: true }>,
	code: string,
	words: EntryWords
) {
	if (outcome.reason === 'not-found') {
		return fail(404, { deleteError: `This ${words.noun} is no longer in the catalogue.` });
	}
	const surveys = `${outcome.surveys} survey${outcome.surveys === 1 ? '' : 's'}`;
	return fail(409, {
		deleteError: `${code} is used by ${surveys}, so it cannot be deleted. Retire it instead: it leaves the choices for new surveys, and the surveys that use it keep it.`
	});
}
