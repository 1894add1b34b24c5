import { getContext, setContext } from 'svelte';
import type { DataStep, SurveyData } from '$lib/schemas/survey';
import type { UnitSystem } from '$lib/units';
import { buildEvaluateBody } from '$lib/survey-input';
import { evaluateProblems } from '$lib/survey-progress';

/** `refused`: the server kept the rest of the step but refused some answers (they are marked). */
export type SaveState = 'saved' | 'saving' | 'unsaved' | 'refused';
export type LiveState = 'idle' | 'incomplete' | 'loading' | 'ready' | 'error';

/** The parts of the engine's answer the live panel shows. */
export interface LiveSetup {
	id: string;
	name: string;
	verdict: 'fits' | 'fits-with-changes' | 'does-not-fit';
	rank: number;
	checks: { code: string; result: 'pass' | 'warn' | 'fail'; message: string; remedy: string | null }[];
}
export interface LiveResult {
	recommended: string | null;
	batteriesPerTruck: number;
	ebu: number;
	changesPerTruckPerDay: number;
	setups: LiveSetup[];
}

const RETRY_MS = [1_000, 2_000, 5_000, 10_000, 20_000, 30_000];
const EVALUATE_DEBOUNCE_MS = 350;

/**
 * Refused answers from a 400 of `PATCH /api/v1/surveys/[id]`: its `errors` are keyed
 * "values.<path>"; gives path → first message. Empty when the answer has no field errors.
 */
export function refusedFields(errors: unknown): Record<string, string> {
	const out: Record<string, string> = {};
	if (!errors || typeof errors !== 'object') return out;
	for (const [key, messages] of Object.entries(errors as Record<string, unknown>)) {
		if (!key.startsWith('values.')) continue;
		const first = Array.isArray(messages) ? messages.find((m) => typeof m === 'string') : null;
		out[key.slice('values.'.length)] = first ?? 'Check this answer.';
	}
	return out;
}

/** The top-level field of a refused path ("palletTrucks.0.forkLengthMm" → "palletTrucks"). */
const topField = (path: string) => path.split('.')[0];

/**
 * What the server kept of `values` when it refused `paths`: a refused answer is left out, a refused
 * answer inside a row or the measured battery is emptied (the rest of the row is kept), and a list
 * with a refused row is not stored at all.
 */
export function keptValues(values: Record<string, unknown>, paths: string[]): Record<string, unknown> {
	const kept = JSON.parse(JSON.stringify(values)) as Record<string, unknown>;
	for (const path of paths) {
		const parts = path.split('.');
		let parent: unknown = kept;
		for (const part of parts.slice(0, -1)) parent = parent && typeof parent === 'object' ? (parent as Record<string, unknown>)[part] : undefined;
		if (parts.length === 1 || Array.isArray(parent) || !parent || typeof parent !== 'object') delete kept[parts[0]];
		else (parent as Record<string, unknown>)[parts[parts.length - 1]] = null;
	}
	return kept;
}

/**
 * The survey being edited in this browser tab: its data, the autosave queue and the live fit
 * answer. Every change is saved to the server; a failed save is kept (also in localStorage, so a
 * reload keeps it) and retried with a visible "not saved yet" state. Answers the server refuses
 * (out of range, malformed) are not retried: they stay marked beside their field until the rep
 * changes them, while the rest of the step is saved.
 */
export class SurveyDraft {
	data: SurveyData = $state({});
	saveState: SaveState = $state('saved');
	lastSavedAt: string | null = $state(null);
	/** a refusal without field errors (should not happen from the wizard's own forms) */
	saveError: string | null = $state(null);
	/** refused answers by step, path → message */
	refused: Partial<Record<DataStep, Record<string, string>>> = $state({});
	/** true once a save has failed and is being retried */
	retrying = $state(false);
	version = $state(0);
	live: LiveResult | null = $state(null);
	liveState: LiveState = $state('idle');
	missing: string[] = $state([]);

	#id: string;
	#pending = new Map<DataStep, Record<string, unknown>>();
	/** what the server holds, as far as this tab knows: what refused answers go back to */
	#stored: SurveyData;
	#timer: ReturnType<typeof setTimeout> | null = null;
	#attempt = 0;
	#flushing = false;
	#evalTimer: ReturnType<typeof setTimeout> | null = null;
	#evalController: AbortController | null = null;
	#evalSeq = 0;

	/** the rep's units: the engine writes its figures in them first */
	#units: UnitSystem;

	constructor(id: string, data: SurveyData, version: number, updatedAt: string, units: UnitSystem = 'metric') {
		this.#id = id;
		this.#units = units;
		this.data = data;
		this.#stored = JSON.parse(JSON.stringify(data ?? {})) as SurveyData;
		this.version = version;
		this.lastSavedAt = updatedAt;
	}

	get storageKey() {
		return `traywise:survey:${this.#id}:pending`;
	}

	/** Replays edits that a previous page load could not save (reload while offline). */
	restorePending() {
		if (typeof localStorage === 'undefined') return;
		const raw = localStorage.getItem(this.storageKey);
		if (!raw) return;
		try {
			const pending = JSON.parse(raw) as Partial<Record<DataStep, Record<string, unknown>>>;
			for (const [step, values] of Object.entries(pending)) {
				if (values) this.update(step as DataStep, values, { evaluate: false });
			}
		} catch {
			localStorage.removeItem(this.storageKey);
		}
	}

	/** Records a step's values, saves them soon and refreshes the live fit. */
	update(step: DataStep, values: Record<string, unknown>, opts: { evaluate?: boolean } = {}) {
		const clean = JSON.parse(JSON.stringify(values)) as Record<string, unknown>;
		this.data = { ...this.data, [step]: { ...(this.data[step] ?? {}), ...clean } };
		this.#pending.set(step, { ...(this.#pending.get(step) ?? {}), ...clean });
		this.#persistPending();
		this.saveState = 'unsaved';
		this.#schedule(150);
		if (opts.evaluate !== false) this.scheduleEvaluate();
	}

	/**
	 * Keeps unsaved edits across a reload, leaving out answers the server has already refused as
	 * they stand: replaying those after a reload would only be refused again (a re-send of the
	 * whole step, say on leaving a field, can still carry one when the page is reloaded mid-save).
	 */
	#persistPending() {
		if (typeof localStorage === 'undefined') return;
		const keep: Partial<Record<DataStep, Record<string, unknown>>> = {};
		for (const [step, values] of this.#pending) {
			const refused = this.#refusedValues[step] ?? {};
			const rest = Object.fromEntries(
				Object.entries(values).filter(([k, v]) => !(Object.hasOwn(refused, k) && JSON.stringify(refused[k]) === JSON.stringify(v)))
			);
			if (Object.keys(rest).length) keep[step] = rest;
		}
		if (Object.keys(keep).length === 0) localStorage.removeItem(this.storageKey);
		else localStorage.setItem(this.storageKey, JSON.stringify(keep));
	}

	/** the values the server refused, by step and top-level field, as they were sent */
	#refusedValues: Partial<Record<DataStep, Record<string, unknown>>> = {};

	#schedule(ms: number) {
		if (this.#timer) clearTimeout(this.#timer);
		this.#timer = setTimeout(() => void this.flush(), ms);
	}

	/** Sends every pending step; on failure keeps them and retries with backoff. */
	async flush(): Promise<boolean> {
		if (this.#flushing || this.#pending.size === 0) return this.#pending.size === 0;
		this.#flushing = true;
		this.saveState = 'saving';
		try {
			for (const [step, values] of [...this.#pending]) {
				const res = await fetch(`/api/v1/surveys/${this.#id}`, {
					method: 'PATCH',
					headers: { 'content-type': 'application/json', accept: 'application/json' },
					body: JSON.stringify({ step, values, version: this.version })
				});
				if (res.status !== 400 && !res.ok) throw new Error(`save failed: ${res.status}`);
				const body = (await res.json().catch(() => ({}))) as {
					version?: number;
					updatedAt?: string;
					message?: string;
					errors?: unknown;
				};
				const refused = res.ok ? {} : refusedFields(body.errors);
				if (!res.ok && Object.keys(refused).length === 0) {
					// refused as a whole, for no one field: retrying would not help
					this.saveError = body.message ?? 'This step could not be saved; reload the page and try again.';
				} else {
					this.saveError = null;
					this.#settle(step, values, refused);
				}
				if (typeof body.version === 'number') this.version = body.version;
				if (typeof body.updatedAt === 'string') this.lastSavedAt = body.updatedAt;
				// only forget what was sent if nothing newer arrived meanwhile
				if (JSON.stringify(this.#pending.get(step)) === JSON.stringify(values)) this.#pending.delete(step);
			}
			this.#attempt = 0;
			this.retrying = false;
			this.#persistPending();
			this.saveState = this.#pending.size ? 'unsaved' : this.hasRefused ? 'refused' : 'saved';
			if (this.#pending.size) this.#schedule(100);
			return this.#pending.size === 0;
		} catch {
			this.saveState = 'unsaved';
			this.retrying = true;
			const wait = RETRY_MS[Math.min(this.#attempt++, RETRY_MS.length - 1)];
			this.#schedule(wait);
			return false;
		} finally {
			this.#flushing = false;
		}
	}

	/** Records the server's answer to one step's values: what it kept, and what it refused. */
	#settle(step: DataStep, values: Record<string, unknown>, refused: Record<string, string>) {
		const paths = Object.keys(refused);
		this.#stored = { ...this.#stored, [step]: { ...(this.#stored[step] ?? {}), ...keptValues(values, paths) } };
		// answers sent this time replace their old refusals; answers not sent keep theirs
		const still = Object.fromEntries(Object.entries(this.refused[step] ?? {}).filter(([path]) => !Object.hasOwn(values, topField(path))));
		const next = { ...still, ...refused };
		const sentValues = Object.fromEntries(Object.keys(next).map(topField).filter((k) => Object.hasOwn(values, k)).map((k) => [k, values[k]]));
		const keptRefused = Object.fromEntries(
			Object.entries(this.#refusedValues[step] ?? {}).filter(([k]) => !Object.hasOwn(values, k))
		);
		this.#refusedValues = { ...this.#refusedValues, [step]: { ...keptRefused, ...sentValues } };
		const all = { ...this.refused };
		if (Object.keys(next).length) all[step] = next;
		else delete all[step];
		this.refused = all;
	}

	/** The refused answer's message for a field of a step (its path inside the step), if any. */
	fieldError(step: DataStep, path: string): string | null {
		return this.refused[step]?.[path] ?? null;
	}

	/** How many answers are refused, over every step. */
	get refusedCount(): number {
		return Object.values(this.refused).reduce((n, r) => n + Object.keys(r ?? {}).length, 0);
	}

	get hasRefused(): boolean {
		return this.refusedCount > 0 || this.saveError !== null;
	}

	/** Something typed is not on the server: waiting, retrying, or refused. */
	get hasUnsaved() {
		return this.#pending.size > 0 || this.hasRefused;
	}

	/** Saves are waiting or in flight (not refused ones). */
	get hasPending() {
		return this.#pending.size > 0;
	}

	/**
	 * Drops the refused answers (the rep chose to leave them): the survey goes back to what the
	 * server holds for those fields.
	 */
	discardRefused() {
		const data = { ...this.data };
		for (const [step, paths] of Object.entries(this.refused) as [DataStep, Record<string, string>][]) {
			const current = { ...((data[step] ?? {}) as Record<string, unknown>) };
			const stored = (this.#stored[step] ?? {}) as Record<string, unknown>;
			for (const field of new Set(Object.keys(paths).map(topField))) {
				if (Object.hasOwn(stored, field)) current[field] = stored[field];
				else delete current[field];
			}
			(data as Record<string, unknown>)[step] = current;
		}
		this.data = data;
		this.refused = {};
		this.saveError = null;
		if (this.saveState === 'refused') this.saveState = this.#pending.size ? 'unsaved' : 'saved';
		this.scheduleEvaluate();
	}

	/**
	 * Takes the survey as the server sent it with a page (after Next or Back, which save too):
	 * answers still waiting to be saved or refused here stay on top.
	 */
	adopt(server: SurveyData, version: number, updatedAt: string) {
		this.#stored = JSON.parse(JSON.stringify(server ?? {})) as SurveyData;
		const data: SurveyData = { ...this.#stored };
		const local = this.data as Record<string, Record<string, unknown> | undefined>;
		for (const step of new Set([...this.#pending.keys(), ...(Object.keys(this.refused) as DataStep[])])) {
			const mine: Record<string, unknown> = { ...(this.#pending.get(step) ?? {}) };
			for (const path of Object.keys(this.refused[step] ?? {})) {
				const field = topField(path);
				if (local[step] && Object.hasOwn(local[step], field)) mine[field] = local[step][field];
			}
			(data as Record<string, unknown>)[step] = { ...((data[step] ?? {}) as Record<string, unknown>), ...mine };
		}
		this.data = data;
		if (version > this.version) {
			this.version = version;
			this.lastSavedAt = updatedAt;
		}
	}

	scheduleEvaluate() {
		if (this.#evalTimer) clearTimeout(this.#evalTimer);
		this.#evalTimer = setTimeout(() => void this.evaluate(), EVALUATE_DEBOUNCE_MS);
	}

	/** Asks the engine about the current answers; only the latest request's answer is shown. */
	async evaluate() {
		const built = buildEvaluateBody(this.data);
		if (!built.ok) {
			this.#evalController?.abort();
			this.missing = built.missing;
			this.liveState = 'incomplete';
			return;
		}
		this.missing = [];
		this.#evalController?.abort();
		const controller = new AbortController();
		this.#evalController = controller;
		const seq = ++this.#evalSeq;
		this.liveState = 'loading';
		try {
			const res = await fetch('/api/v1/evaluate', {
				method: 'POST',
				headers: { 'content-type': 'application/json', accept: 'application/json' },
				body: JSON.stringify({ ...built.body, units: this.#units }),
				signal: controller.signal
			});
			if (seq !== this.#evalSeq) return;
			if (!res.ok) {
				const body = await res.json().catch(() => ({}));
				this.missing = evaluateProblems(body.errors as Record<string, string[]> | undefined);
				this.liveState = res.status === 400 ? 'incomplete' : 'error';
				return;
			}
			this.live = (await res.json()) as LiveResult;
			this.liveState = 'ready';
		} catch (err) {
			if ((err as Error).name === 'AbortError') return;
			if (seq === this.#evalSeq) this.liveState = 'error';
		}
	}
}

const KEY = Symbol('survey-draft');
export function setSurveyDraft(draft: SurveyDraft) {
	return setContext(KEY, draft);
}
export function getSurveyDraft(): SurveyDraft {
	return getContext<SurveyDraft>(KEY);
}
