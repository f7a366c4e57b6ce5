import { expect, test } from '@playwright/test';
import { ANALYST, SHOTS, VIEWER, signIn } from './demo';

test('the analyst signs in, creates a column and finds it in the table', async ({ page }) => {
	await page.goto('/columns');
	await expect(page).toHaveURL(/\/signin\?redirectTo=/);
	await page.screenshot({ path: `${SHOTS}/01-sign-in.png`, fullPage: true });

	await signIn(page, ANALYST);
	await page.screenshot({ path: `${SHOTS}/02-home-analyst.png`, fullPage: true });

	await page.getByRole('link', { name: 'Columns', exact: true }).click();
	await expect(page.getByRole('heading', { name: 'Columns' })).toBeVisible();
	await page.getByRole('link', { name: 'New column' }).click();
	await expect(page.getByRole('heading', { name: 'New column' })).toBeVisible();

	// a field-level error first: the diameter is missing
	const tag = `E2E-${Date.now().toString(36).toUpperCase()}`;
	await page.getByLabel('Tag', { exact: true }).fill(tag);
	await page.getByLabel('Service', { exact: true }).fill('Bench-top bubble column, nitrogen into glycerol solution');
	await page.getByLabel('Height', { exact: true }).fill('1.8');
	await page.getByRole('button', { name: 'Create column' }).click();
	await expect(page.getByText('Enter the inner diameter.')).toBeVisible();
	await page.screenshot({ path: `${SHOTS}/03-new-column-error.png`, fullPage: true });

	await page.getByLabel('Inner diameter', { exact: true }).fill('0.14');
	await page.getByRole('button', { name: 'Create column' }).click();
	await expect(page.getByRole('heading', { name: tag })).toBeVisible();
	await page.screenshot({ path: `${SHOTS}/04-column-page.png`, fullPage: true });

	await page.getByRole('link', { name: '← Columns' }).click();
	const row = page.getByRole('row', { name: new RegExp(tag) });
	await expect(row).toBeVisible();
	await expect(row).toContainText('0.14');
	await expect(row).toContainText('1.8');

	// filter and sort work in the browser too
	await page.getByLabel('Filter by tag or service').fill(tag);
	await page.getByRole('button', { name: 'Filter' }).click();
	await expect(page.getByRole('row')).toHaveCount(2);
	await page.getByRole('link', { name: 'Clear' }).click();
	// the second click must wait for the first navigation: until then the link still points at the ascending order
	await page.getByRole('link', { name: /Height/ }).click();
	await expect(page.getByRole('columnheader', { name: /Height/ })).toHaveAttribute('aria-sort', 'ascending');
	await page.getByRole('link', { name: /Height/ }).click();
	await expect(page).toHaveURL(/sort=heightM&dir=desc/);
	await expect(page.getByRole('columnheader', { name: /Height/ })).toHaveAttribute('aria-sort', 'descending');
	// the fourth cell of each row is the height in metres; the demo's R-201 (9 m) is among them
	const heights = (await page.locator('tbody tr td:nth-child(4)').allInnerTexts()).map(Number);
	expect(heights).toContain(9);
	expect(heights).toEqual([...heights].sort((a, b) => b - a));
	await page.screenshot({ path: `${SHOTS}/05-columns-table.png`, fullPage: true });
});

test('the viewer sees no create button and is refused the create action with 403', async ({ page }) => {
	await signIn(page, VIEWER);
	await page.goto('/columns');
	await expect(page.getByRole('heading', { name: 'Columns' })).toBeVisible();
	await expect(page.getByRole('row', { name: /C-101/ })).toBeVisible();
	await expect(page.getByRole('link', { name: 'New column' })).toHaveCount(0);
	await expect(page.getByRole('link', { name: 'Delete' })).toHaveCount(0);
	await page.screenshot({ path: `${SHOTS}/06-columns-viewer.png`, fullPage: true });

	// the action itself, posted with the viewer's session as a crafted form would
	const res = await page.request.post('/columns/new', {
		form: { tag: 'SNEAK-1', service: '', diameterM: '1', heightM: '1', notes: '' },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(res.status()).toBe(403);

	const direct = await page.goto('/columns/new');
	expect(direct?.status()).toBe(403);
	await expect(page.getByRole('heading', { name: 'Not allowed' })).toBeVisible();
	await page.screenshot({ path: `${SHOTS}/07-viewer-403.png`, fullPage: true });
});

test('the admin invites a member and reads the invitation in the outgoing-mail box', async ({ page }) => {
	await signIn(page, 'admin@marrowbay.test');
	await page.getByRole('link', { name: 'Team', exact: true }).click();
	await expect(page.getByRole('heading', { name: 'Team' })).toBeVisible();
	await expect(page.getByRole('row', { name: /viewer@marrowbay\.test/ })).toBeVisible();

	const email = `e2e-${Date.now()}@marrowbay.test`;
	await page.getByLabel('E-mail', { exact: true }).fill(email);
	await page.getByRole('radio', { name: /^lead/ }).check();
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByText(`Invitation sent to ${email}.`)).toBeVisible();
	await expect(page.getByRole('listitem').filter({ hasText: email })).toContainText('lead');
	await page.screenshot({ path: `${SHOTS}/08-team-admin.png`, fullPage: true });

	await page.getByRole('link', { name: 'Outgoing mail' }).click();
	await page.getByRole('link', { name: /invites you to Marrow Bay Process Group/ }).first().click();
	await expect(page.getByText(email).first()).toBeVisible();
	await expect(page.locator('pre')).toContainText('/invite/');
	await page.screenshot({ path: `${SHOTS}/09-outgoing-mail.png`, fullPage: true });

	// the invitee opens the link from the message
	const link = /https?:\/\/\S+\/invite\/\S+/.exec(await page.locator('pre').innerText())?.[0];
	expect(link).toBeTruthy();
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/signin/);
	await page.goto(new URL(link!).pathname);
	await expect(page.getByRole('heading', { name: 'Join Marrow Bay Process Group' })).toBeVisible();
	await page.screenshot({ path: `${SHOTS}/10-accept-invitation.png`, fullPage: true });
});
