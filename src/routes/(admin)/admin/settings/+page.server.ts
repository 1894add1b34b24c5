import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requirePermission } from '$lib/server/auth/guard';
import {
	addTaxRate,
	getCompanySettings,
	listTaxRates,
	removeLogo,
	removeTaxRate,
	setLogo,
	updateCompanySettings,
	updateTaxRate,
	type CompanySettingsRow
} from '$lib/server/repositories/pricing';
import { readForm } from '$lib/server/read-form';
import { MAX_LOGO_BYTES } from '$lib/server/settings/logo';
import { percentText } from '$lib/percent';
import {
	settingsInput,
	settingsSchema,
	taxRateInput,
	taxRateSchema,
	taxRateUpdateSchema,
	type SettingsForm
} from '$lib/schemas/settings';
import type { Actions, PageServerLoad } from './$types';

const settingsAdapter = zod4(settingsSchema);
const taxAdapter = zod4(taxRateSchema);

function formValues(s: Omit<CompanySettingsRow, 'logoPath' | 'updatedAt'>): SettingsForm {
	return {
		dealerName: s.dealerName,
		address: s.address,
		phone: s.phone,
		email: s.email,
		repDiscountAuthority: percentText(s.repDiscountAuthorityBp),
		marginFloor: percentText(s.marginFloorBp),
		depositShare: percentText(s.depositShareBp),
		quoteValidityDays: s.quoteValidityDays,
		termsText: s.termsText,
		currency: s.currency as SettingsForm['currency'],
		timeZone: s.timeZone
	};
}

function timeZones(current: string): string[] {
	const zones = new Set(Intl.supportedValuesOf('timeZone'));
	zones.add('UTC');
	zones.add(current);
	return [...zones].sort();
}

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'admin:settings');
	const [settings, taxRates] = await Promise.all([getCompanySettings(), listTaxRates()]);
	return {
		form: await superValidate(formValues(settings), settingsAdapter, { errors: false }),
		taxForm: await superValidate(taxAdapter),
		taxRates: taxRates.map((t) => ({ ...t, rate: percentText(t.rateBp) })),
		logoPath: settings.logoPath,
		timeZones: timeZones(settings.timeZone),
		maxLogoBytes: MAX_LOGO_BYTES
	};
};

const megabytes = (bytes: number) => `${(bytes / (1024 * 1024)).toFixed(1)} MB`;

// Bodies are read whole before sizes are checked (BODY_SIZE_LIMIT caps them): answering before the
// body is read leaves the browser's connection in a broken state instead of showing the message.

export const actions: Actions = {
	/** The dealer block and the quote rules. */
	save: async (event) => {
		const user = requirePermission(event, 'admin:settings');
		const form = await superValidate(event.request, settingsAdapter);
		if (!form.valid) return fail(400, { form });
		const input = settingsInput(form.data);
		await updateCompanySettings(input, user.id);
		// show what was stored: "10 %" comes back as "10"
		form.data = formValues(input);
		return message(form, 'Settings saved. New quotes use them; quotes already made keep theirs.');
	},

	addTaxRate: async (event) => {
		requirePermission(event, 'admin:settings');
		const form = await superValidate(event.request, taxAdapter);
		if (!form.valid) return fail(400, { taxForm: form });
		const result = await addTaxRate(taxRateInput(form.data));
		if (!result.ok)
			return setError(
				form,
				'regionCode',
				`${form.data.regionCode} has a rate already; change that row instead.`,
				{ status: 409 }
			);
		return message(
			form,
			`Added ${form.data.regionCode} at ${form.data.rate.replace(/\s*%$/, '')} %.`
		);
	},

	updateTaxRate: async (event) => {
		requirePermission(event, 'admin:settings');
		const raw = await readForm(event.request);
		if (!raw)
			return fail(400, {
				taxError: { id: null, message: 'The form did not arrive whole; try again.' }
			});
		const values = {
			id: String(raw.get('id') ?? ''),
			regionCode: String(raw.get('regionCode') ?? ''),
			label: String(raw.get('label') ?? ''),
			rate: String(raw.get('rate') ?? '')
		};
		const parsed = taxRateUpdateSchema.safeParse(values);
		if (!parsed.success) {
			return fail(400, {
				taxError: { id: values.id, message: parsed.error.issues[0]?.message ?? 'Check the row.' }
			});
		}
		const result = await updateTaxRate(parsed.data.id, taxRateInput(parsed.data));
		if (!result.ok) {
			return result.reason === 'duplicate'
				? fail(409, {
						taxError: {
							id: values.id,
							message: `${parsed.data.regionCode} has a rate already; change that row instead.`
						}
					})
				: fail(404, { taxError: { id: values.id, message: 'That rate was removed meanwhile.' } });
		}
		return { taxSaved: parsed.data.id };
	},

	removeTaxRate: async (event) => {
		requirePermission(event, 'admin:settings');
		const raw = await readForm(event.request);
		const id = String(raw?.get('id') ?? '');
		if (!(await removeTaxRate(id)))
			return fail(404, { taxError: { id, message: 'That rate was removed already.' } });
		return { taxRemoved: true };
	},

	/** A PNG or JPEG logo for the quote PDF, checked from its bytes. */
	logo: async (event) => {
		const user = requirePermission(event, 'admin:settings');
		const raw = await readForm(event.request);
		const file = raw?.get('logo');
		if (!(file instanceof File) || file.size === 0) {
			return fail(400, { logoError: 'Choose a PNG or JPEG file for the logo.' });
		}
		if (file.size > MAX_LOGO_BYTES) {
			return fail(413, {
				logoError: `The logo file is ${megabytes(file.size)}; the limit is 2 MB. Export it smaller and try again.`
			});
		}
		const result = await setLogo(new Uint8Array(await file.arrayBuffer()), user.id);
		if (!result.ok) return fail(400, { logoError: result.message });
		return { logoSaved: true };
	},

	removeLogo: async (event) => {
		const user = requirePermission(event, 'admin:settings');
		await removeLogo(user.id);
		return { logoRemoved: true };
	}
};
