import { getContext, setContext } from 'svelte';
import type { DataStep, SurveyData } from '$lib/schemas/survey';
import { buildEvaluateBody } from '$lib/survey-input';

export type SaveState = 'saved' | 'saving' | 'unsaved';
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
 * The survey being edited in this browser tab: its data, the autosave queue and the live fit
 * answer. Every change is saved to the server; a failed save is kept (also in localStorage, so a
 * reload keeps it) and retried with a visible "not saved yet" state.
 */
export class SurveyDraft {
	data: SurveyData = $state({});
	saveState: SaveState = $state('saved');
	lastSavedAt: string | null = $state(null);
	saveError: string | null = $state(null);
	/** true once a save has failed and is being retried */
	retrying = $state(false);
	version = $state(0);
	live: LiveResult | null = $state(null);
	liveState: LiveState = $state('idle');
	missing: string[] = $state([]);

	#id: string;
	#pending = new Map<DataStep, Record<string, unknown>>();
	#timer: ReturnType<typeof setTimeout> | null = null;
	#attempt = 0;
	#flushing = false;
	#evalTimer: ReturnType<typeof setTimeout> | null = null;
	#evalController: AbortController | null = null;
	#evalSeq = 0;

	constructor(id: string, data: SurveyData, version: number, updatedAt: string) {
		this.#id = id;
		this.data = data;
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

	#persistPending() {
		if (typeof localStorage === 'undefined') return;
		if (this.#pending.size === 0) localStorage.removeItem(this.storageKey);
		else localStorage.setItem(this.storageKey, JSON.stringify(Object.fromEntries(this.#pending)));
	}

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
				if (res.status === 400) {
					// the server refused these values: keep the rest going, show why
					const body = await res.json().catch(() => ({}));
					this.saveError = body.message ?? 'Some values could not be saved.';
					this.#pending.delete(step);
					continue;
				}
				if (!res.ok) throw new Error(`save failed: ${res.status}`);
				const body = (await res.json()) as { version: number; updatedAt: string };
				// only forget what was sent if nothing newer arrived meanwhile
				if (JSON.stringify(this.#pending.get(step)) === JSON.stringify(values)) this.#pending.delete(step);
				this.version = body.version;
				this.lastSavedAt = body.updatedAt;
				this.saveError = null;
			}
			this.#attempt = 0;
			this.retrying = false;
			this.#persistPending();
			this.saveState = this.#pending.size ? 'unsaved' : 'saved';
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

	get hasUnsaved() {
		return this.#pending.size > 0;
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
				body: JSON.stringify(built.body),
				signal: controller.signal
			});
			if (seq !== this.#evalSeq) return;
			if (!res.ok) {
				const body = await res.json().catch(() => ({}));
				this.missing = Object.entries((body.errors ?? {}) as Record<string, string[]>).map(([k, v]) => `${k}: ${v[0]}`);
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
