/**
 * What the browser tests share: the demo sign-ins of the seed (src/lib/server/seed.ts, local only),
 * where screenshots go, and signing in through the sign-in page.
 */
import { expect, type Page } from '@playwright/test';

export const DEMO_PASSWORD = 'bubbles-demo-1';
export const ANALYST = 'analyst@marrowbay.test';
export const VIEWER = 'viewer@marrowbay.test';
export const LEAD = 'lead@marrowbay.test';
export const SHOTS = 'artifacts/screenshots';

export async function signIn(page: Page, email: string) {
	await page.goto('/signin');
	// typed before hydration, a value can be reset by it: wait until the page has settled
	await page.waitForLoadState('networkidle');
	await page.getByLabel('E-mail', { exact: true }).fill(email);
	await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('navigation').getByText('Sign out')).toBeVisible();
}

/** From a signed-in page: Columns → C-101 → New case, waiting until the editor has hydrated. */
export async function openNewCaseOfPilot(page: Page) {
	await page.getByRole('link', { name: 'Columns', exact: true }).click();
	await expect(page.getByRole('heading', { name: 'Columns' })).toBeVisible();
	await page.getByRole('link', { name: 'C-101', exact: true }).click();
	await page.getByTestId('new-case').click();
	await expect(page.getByTestId('case-editor')).toBeVisible();
	await page.waitForLoadState('networkidle');
}

/**
 * From a lead's signed-in page: Compare → the column → the runs, with the first of `runIds` as the baseline
 * unless another is given, saved under `name`; waits for the comparison page.
 */
export async function compareRuns(lead: Page, o: { runIds: string[]; name: string; baselineRunId?: string; column?: string }) {
	await lead.getByRole('link', { name: 'Compare', exact: true }).click();
	await lead.getByTestId('compare-column').selectOption({ label: o.column ?? 'C-101' });
	await lead.getByTestId('compare-start').click();
	for (const id of o.runIds) await lead.locator(`input[name="runIds"][value="${id}"]`).check();
	await lead.locator(`input[name="baselineRunId"][value="${o.baselineRunId ?? o.runIds[0]}"]`).check();
	await lead.getByTestId('comparison-name').fill(o.name);
	await lead.getByTestId('save-comparison').click();
	await expect(lead).toHaveURL(/\/compare\/[0-9a-f-]{36}$/);
}

/**
 * From the case editor: Save and queue run, then wait on the run page until the run ends with a status matching
 * `status` (by default converged or finished). Returns the run's id.
 */
export async function queueRun(page: Page, status: string | RegExp = /converged|finished/): Promise<string> {
	await page.getByTestId('queue-run').click();
	await expect(page).toHaveURL(/\/runs\/[0-9a-f-]{36}$/);
	const runId = page.url().split('/').pop()!;
	await expect(page.getByTestId('run-status')).toHaveAttribute('data-status', status, { timeout: 180_000 });
	return runId;
}
