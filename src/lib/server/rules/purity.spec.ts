import { describe, it, expect } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const dir = path.dirname(fileURLToPath(import.meta.url));
/** pure modules outside the engine folder it may import */
const SHARED = ['../../units', '../../labels'];

describe('the engine stays pure (shared/DESIGN.md §3)', () => {
	it('imports only its own modules, ../../units and ../../labels: no SvelteKit, Sequelize, zod, SDK or I/O', () => {
		const sources = readdirSync(dir).filter(
			(f) => f.endsWith('.ts') && !f.endsWith('.spec.ts') && f !== 'testing.ts'
		);
		expect(sources).toContain('evaluate.ts');
		for (const f of sources) {
			const text = readFileSync(path.join(dir, f), 'utf8');
			const specifiers = [...text.matchAll(/(?:import|export)[^'"]*?from\s+['"]([^'"]+)['"]/g)].map(
				(m) => m[1]
			);
			for (const s of specifiers) {
				expect(SHARED.includes(s) || /^\.\/[\w-]+$/.test(s), `${f} imports ${s}`).toBe(true);
			}
			expect(text, f).not.toMatch(/\bimport\(/);
		}
	});

	it('the two modules it shares with the pages import nothing at all', () => {
		for (const s of SHARED) {
			const text = readFileSync(path.join(dir, `${s}.ts`), 'utf8');
			expect(text, s).not.toMatch(/^\s*import\s/m);
			expect(text, s).not.toMatch(/\bimport\(|\brequire\(/);
		}
	});
});
