import { expect, type Page } from '@playwright/test';
import path from 'node:path';
import { mkdirSync } from 'node:fs';

export const DEMO_PASSWORD = 'traywise-demo';
export const ARTIFACTS = process.env.ARTIFACTS_DIR ?? 'artifacts';
mkdirSync(path.join(ARTIFACTS, 'screenshots'), { recursive: true });

export async function shot(page: Page, name: string) {
	await page.screenshot({ path: path.join(ARTIFACTS, 'screenshots', `${name}.png`), fullPage: true });
}

/** Waits until SvelteKit has hydrated the page, so clicks are not lost. */
export async function hydrated(page: Page) {
	await page.waitForFunction(() => document.body.dataset.hydrated === 'true', null, { timeout: 15_000 });
	await page.waitForLoadState('networkidle');
}

export async function signIn(page: Page, email: string) {
	await page.goto('/login');
	await hydrated(page);
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(DEMO_PASSWORD);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).not.toHaveURL(/\/login/);
}
