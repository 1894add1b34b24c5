import { randomUUID } from 'node:crypto';
import { evaluateFieldErrors, evaluateRequestSchema } from '$lib/schemas/evaluate';
import { evaluate } from './rules';
import type { EvaluateResult, ResolvedInput } from './rules/types';
import { engineCatalogue, findBattery, findTruckModel } from './repositories/catalogue';

export type FieldErrors = Record<string, string[]>;

export type EvaluationOutcome =
	| { ok: true; result: EvaluateResult; input: ResolvedInput }
	| { ok: false; status: 400; message: string; errors: FieldErrors };

/** zod issues as `{ "site.palletTrucks.0.forkLengthMm": ["…"] }` */
export function fieldErrors(issues: readonly { path: readonly PropertyKey[]; message: string }[]): FieldErrors {
	// no prototype: a field named "__proto__" is a field like any other
	const out: FieldErrors = Object.create(null);
	for (const issue of issues) {
		const key = issue.path.map(String).join('.') || '(body)';
		(out[key] ??= []).push(issue.message);
	}
	return out;
}

/**
 * Validates an evaluate request, resolves catalogue references (`{ modelId }`) and runs the engine.
 * Used by `POST /api/v1/evaluate` and by the survey's recommendation screen, so both give the same
 * answer to the same question.
 */
export async function runEvaluation(body: unknown): Promise<EvaluationOutcome> {
	const parsed = evaluateRequestSchema.safeParse(body);
	if (!parsed.success) {
		return { ok: false, status: 400, message: 'Some fields are missing or out of range.', errors: evaluateFieldErrors(parsed.error) };
	}
	const req = parsed.data;
	const errors: FieldErrors = {};

	let truck: ResolvedInput['truck'] | null = null;
	if ('modelId' in req.truck) {
		const row = await findTruckModel(req.truck.modelId);
		if (row) truck = row.spec;
		else errors['truck.modelId'] = ['No truck model with this id in the catalogue.'];
	} else truck = req.truck as ResolvedInput['truck'];

	let battery: ResolvedInput['battery'] | null = null;
	if ('modelId' in req.battery) {
		const row = await findBattery(req.battery.modelId);
		if (row) battery = row.spec;
		else errors['battery.modelId'] = ['No battery with this id in the catalogue.'];
	} else battery = req.battery as ResolvedInput['battery'];

	if (!truck || !battery) return { ok: false, status: 400, message: 'Unknown catalogue reference.', errors };

	const input = { ...req, truck, battery } as ResolvedInput;
	try {
		const result = evaluate(input, await engineCatalogue());
		return { ok: true, result, input };
	} catch (err) {
		// The engine is property-tested never to throw on schema-valid input; if it still does,
		// the caller gets a clear answer and the log gets the details.
		const errorId = randomUUID();
		console.error(`[traywise] ${errorId} engine failed`, err);
		return {
			ok: false,
			status: 400,
			message: `These values could not be evaluated (reference ${errorId}).`,
			errors: { '(body)': ['These values could not be evaluated.'] }
		};
	}
}
