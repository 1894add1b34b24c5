import { superForm, type SuperValidated } from 'sveltekit-superforms';

/**
 * The browser side of a catalogue entry's form: it keeps what was typed after a save, and a
 * refused save scrolls to the first field marked wrong.
 */
export function entrySuperForm<T extends Record<string, unknown>>(initial: SuperValidated<T>) {
	return superForm(initial, {
		resetForm: false,
		scrollToError: 'smooth',
		errorSelector: '[aria-invalid="true"]'
	});
}

/** The server's messages for one flat field, from a form's errors. */
export function fieldErrors(errors: unknown, name: string): string[] | null {
	return ((errors as Record<string, unknown>)[name] as string[] | undefined) ?? null;
}
