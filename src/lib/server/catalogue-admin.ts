/**
 * The catalogue admin's answers to a refused save or delete, shared by the truck model, battery
 * and equipment pages so that each says the same thing the same way.
 */
import { fail } from '@sveltejs/kit';
import { setError, type SuperValidated } from 'sveltekit-superforms';
import type { CatalogueDeleteOutcome, CatalogueSaveOutcome } from './repositories/catalogue';

type Refused = Exclude<CatalogueSaveOutcome<unknown>, { ok: true }>;

export interface EntryWords {
	/** "truck model", "battery", "equipment item" */
	noun: string;
	/** form field of the unique code: 'code' or 'sku' */
	codeField: 'code' | 'sku';
	/** "code" or "SKU" */
	codeNoun: string;
}

export const TRUCK_WORDS: EntryWords = { noun: 'truck model', codeField: 'code', codeNoun: 'code' };
export const BATTERY_WORDS: EntryWords = { noun: 'battery', codeField: 'code', codeNoun: 'code' };
export const EQUIPMENT_WORDS: EntryWords = {
	noun: 'equipment item',
	codeField: 'sku',
	codeNoun: 'SKU'
};

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
