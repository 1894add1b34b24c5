import { DATA_STEPS, FIELD_LABELS, isStepComplete, stepProblems, type DataStep, type SurveyData, type SurveyStep } from './schemas/survey';
import { buildEvaluateBody } from './survey-input';

/**
 * Where a survey stands, by the one rule the step indicator and the review share: a step is
 * complete once saved with answers that pass its own schema; the review is complete when every
 * step is and the engine has all it needs.
 */
export interface SurveyProgress {
	complete: Record<SurveyStep, boolean>;
	/** steps not complete yet, with what each still needs (messages as the step shows them) */
	incomplete: { step: DataStep; problems: string[] }[];
	/** what the engine still lacks, in the wizard's words ("truck model", "battery") */
	engineMissing: string[];
}

export function surveyProgress(data: SurveyData): SurveyProgress {
	const complete = {} as Record<SurveyStep, boolean>;
	const incomplete: SurveyProgress['incomplete'] = [];
	for (const step of DATA_STEPS) {
		complete[step] = isStepComplete(step, data);
		if (!complete[step]) incomplete.push({ step, problems: stepProblems(step, data) });
	}
	const built = buildEvaluateBody(data);
	const engineMissing = built.ok ? [] : built.missing;
	complete.review = incomplete.length === 0 && built.ok;
	return { complete, incomplete, engineMissing };
}

/** The wizard's label for a field of the engine's request ("operation.hoursPerShift" → "Hours per shift"). */
export function evaluateFieldLabel(path: string): string {
	const [head, field] = path.split('.');
	if (head === 'truck') return 'Truck model';
	if (head === 'battery') return 'Battery';
	if (head === 'fleet') return FIELD_LABELS.fleet.trucks;
	if (head === 'operation') return FIELD_LABELS.operation[field] ?? 'Operation';
	if (head === 'site') {
		if (field === 'palletTrucks') return FIELD_LABELS.equipment.palletTrucks;
		if (field === 'rollerStands') return FIELD_LABELS.equipment.rollerStands;
		if (field === 'crane') return FIELD_LABELS.equipment.hasCrane;
		if (field === 'chargingArea') return FIELD_LABELS.charging.hasArea;
	}
	return 'Survey';
}

const withoutStop = (s: string) => s.trim().replace(/[.。]+$/, '');

/**
 * The engine's field errors (a 400 from POST /api/v1/evaluate) as lines a rep can act on:
 * "Hours per shift — 4 shifts × 12 h is 48 hours a day, …", without the trailing full stop
 * (lists add their own).
 */
export function evaluateProblems(errors: Record<string, string[]> | null | undefined): string[] {
	const out: string[] = [];
	for (const [path, messages] of Object.entries(errors ?? {})) {
		const first = Array.isArray(messages) ? messages.find((m) => typeof m === 'string' && m.trim()) : undefined;
		const line = first ? `${evaluateFieldLabel(path)} — ${withoutStop(first)}` : evaluateFieldLabel(path);
		if (!out.includes(line)) out.push(line);
	}
	return out;
}

/** "a, b and c." for short names; items that are sentences are joined with semicolons. One full stop. */
export function listSentence(items: string[]): string {
	const clean = items.map(withoutStop).filter(Boolean);
	if (clean.length === 0) return '';
	const sep = clean.some((i) => /[,:—]/.test(i)) ? '; ' : ', ';
	return `${clean.join(sep)}.`;
}
