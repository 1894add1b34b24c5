import { expect, test } from '@playwright/test';
import { shot, signIn, hydrated } from './helpers';

const accounts = [
	{ role: 'rep', email: 'rep@demo.traywise.test', start: '/surveys', heading: 'Surveys', nav: ['Surveys', 'Customers', 'Quotes'], hidden: ['Users', 'Approvals'] },
	{ role: 'manager', email: 'manager@demo.traywise.test', start: '/pipeline', heading: 'Pipeline', nav: ['Pipeline', 'Approvals', 'Quotes'], hidden: ['Users'] },
	{ role: 'admin', email: 'admin@demo.traywise.test', start: '/admin/users', heading: 'Users', nav: ['Users', 'Catalogue', 'Price book'], hidden: ['Approvals'] }
];

for (const a of accounts) {
	test(`${a.role} signs in and lands on ${a.start}`, async ({ page }) => {
		for (const [w, h] of [[768, 1024], [1280, 800]] as const) {
			await page.setViewportSize({ width: w, height: h });
			await page.context().clearCookies();
			await signIn(page, a.email);
			await expect(page).toHaveURL(new RegExp(`${a.start}$`));
			await expect(page.getByRole('heading', { level: 1, name: a.heading })).toBeVisible();
			if (w < 1024) await page.getByRole('button', { name: 'Menu' }).click();
			const nav = page.getByRole('navigation', { name: 'Main' });
			for (const label of a.nav) await expect(nav.getByRole('link', { name: label, exact: true })).toBeVisible();
			for (const label of a.hidden) await expect(nav.getByRole('link', { name: label, exact: true })).toHaveCount(0);
			if (w < 1024) await page.getByRole('button', { name: 'Menu' }).click();
			// no sideways scrolling on a portrait tablet
			expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(w);
			await shot(page, `signin-${a.role}-${w}x${h}`);
		}
	});
}

test('wrong password shows one message for both wrong password and unknown e-mail', async ({ page }) => {
	await page.setViewportSize({ width: 768, height: 1024 });
	await page.goto('/login');
	await hydrated(page);
	await page.getByLabel('E-mail').fill('nobody@demo.traywise.test');
	await page.getByLabel('Password').fill('wrong-password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toHaveText('That e-mail and password do not match an active account.');
	await shot(page, 'signin-failed-768x1024');
});
