import { expect, test, type Page } from '@playwright/test';
import { ANALYST, SHOTS, signIn } from './demo';

/** The id of a demo column, from its page's address. */
async function demoColumnId(page: Page, tag: string): Promise<string> {
	await page.goto('/columns');
	await page.getByRole('link', { name: tag, exact: true }).first().click();
	await expect(page.getByRole('heading', { name: tag })).toBeVisible();
	const m = /\/columns\/([0-9a-f-]{36})/.exec(page.url());
	if (!m) throw new Error(`no column id in ${page.url()}`);
	return m[1];
}

test('the analyst previews an upload, sees a bad row refused, fixes it and saves', async ({ page }) => {
	await signIn(page, ANALYST);
	const columnId = await demoColumnId(page, 'C-101');
	await page.goto(`/columns/${columnId}/measurements/new`);
	await expect(page.getByRole('heading', { name: 'Upload measurement' })).toBeVisible();

	const name = `Probe traverse ${Date.now().toString(36)}`;
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByLabel('Superficial gas velocity', { exact: true }).fill('4');
	await page.locator('select[name="xUnit"]').selectOption('cm');
	await page.locator('select[name="yUnit"]').selectOption('%');

	// invented pilot data with a holdup of 140 % in the third data row
	await page.locator('input[type="file"]').setInputFiles({
		name: 'traverse.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from('height_cm,holdup_pct\n20,6.5\n60,9.8\n100,140\n')
	});
	await expect(page.getByTestId('csv-errors')).toContainText('Row 4, column 2 (holdup_pct: gas holdup): 140 % is out of range');
	await expect(page.getByRole('button', { name: 'Save measurement' })).toBeDisabled();
	await page.screenshot({ path: `${SHOTS}/20-upload-refused.png`, fullPage: true });

	await page.locator('input[type="file"]').setInputFiles({
		name: 'traverse.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from('height_cm,holdup_pct\n20,6.5\n60,9.8\n100,10.4\n')
	});
	const table = page.getByTestId('preview-table');
	await expect(table).toBeVisible();
	// 60 cm → 0.6 m and 9.8 % → 0.098 in the SI columns
	await expect(table.getByRole('row').nth(2)).toContainText('0.6');
	await expect(table.getByRole('row').nth(2)).toContainText('0.098');
	await expect(page.getByTestId('preview-chart')).toHaveAttribute('data-points', '3');
	await page.screenshot({ path: `${SHOTS}/21-upload-preview.png`, fullPage: true });

	await page.getByRole('button', { name: 'Save measurement' }).click();
	await expect(page.getByRole('heading', { name })).toBeVisible();
	await expect(page.getByTestId('measurement-facts')).toContainText('0.04 m/s');
	await page.screenshot({ path: `${SHOTS}/22-measurement-page.png`, fullPage: true });
});

test('the analyst uploads a re-aeration test and reads the fitted kLa with its interval', async ({ page }) => {
	await signIn(page, ANALYST);
	const columnId = await demoColumnId(page, 'C-101');
	await page.goto(`/columns/${columnId}/measurements/new`);
	await page.getByLabel('What was measured').selectOption('dissolved-oxygen');
	const name = `Re-aeration ${Date.now().toString(36)}`;
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByLabel('Superficial gas velocity', { exact: true }).fill('4');
	await page.getByLabel('Temperature', { exact: true }).fill('15');
	await page.locator('select[name="xUnit"]').selectOption('min');
	// invented test: C∞ 10.08, C₀ 0.4 mg/L, kLa 12 h⁻¹, with a fixed ±0.03 mg/L wiggle standing in for probe noise
	const lines = ['t_min,DO_mg_L'];
	for (let i = 0; i <= 60; i++) {
		const t = i * 0.5;
		const c = 10.08 - (10.08 - 0.4) * Math.exp((-12 * t) / 60) + 0.03 * Math.sin(1.7 * i);
		lines.push(`${t},${c.toFixed(3)}`);
	}
	await page.locator('input[type="file"]').setInputFiles({ name: 'do-probe-1.csv', mimeType: 'text/csv', buffer: Buffer.from(lines.join('\n')) });
	await expect(page.getByTestId('preview-table')).toBeVisible();
	await page.getByRole('button', { name: 'Save measurement' }).click();
	await expect(page.getByRole('heading', { name })).toBeVisible();

	const fit = page.getByTestId('reaeration-fit');
	await expect(fit).toBeVisible();
	const kla = fit.getByRole('row', { name: /kLa at test temperature/ });
	// the fitted kLa lies near the 12 h⁻¹ the data were made with
	const estimate = Number((await kla.locator('td').nth(1).innerText()).replace(/,/g, ''));
	expect(Math.abs(estimate - 12)).toBeLessThan(0.3);
	await expect(fit.getByRole('row', { name: /kLa20/ })).toBeVisible();
	await expect(fit.getByRole('row', { name: /SOTR/ })).toBeVisible();
	await expect(page.getByTestId('residual-chart')).toHaveAttribute('data-points', '61');
	await page.screenshot({ path: `${SHOTS}/23-reaeration.png`, fullPage: true });
});
