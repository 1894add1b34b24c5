import { describe, it, expect } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const dir = path.dirname(fileURLToPath(import.meta.url));

describe('the engine stays pure (shared/DESIGN.md §3)', () => {
	it('imports only its own modules and ../../units: no SvelteKit, Sequelize, zod, SDK or I/O', () => {
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
				expect(s === '../../units' || /^\.\/[\w-]+$/.test(s), `${f} imports ${s}`).toBe(true);
			}
			expect(text, f).not.toMatch(/\bimport\(/);
		}
	});
});
