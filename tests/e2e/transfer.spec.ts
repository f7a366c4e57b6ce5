/**
 * Mass transfer on screen, in a real browser against the built app and a real worker: the analyst
 * sets up a clean-water re-aeration test in the case editor's Transfer section, the run page shows
 * the dissolved-oxygen profiles, the efficiency numbers and the re-aeration analysis of the run's
 * own series. Screenshots go to artifacts/screenshots (git-ignored).
 */
import { expect, test } from '@playwright/test';
import { compareRuns, openNewCaseOfPilot, queueRun, ANALYST, LEAD, SHOTS, signIn } from './demo';

test.describe.configure({ mode: 'serial', timeout: 240_000 });

let caseUrl = '';
let firstRunId = '';

const number = async (text: Promise<string | null>) => Number((await text)?.replace(/[^0-9.eE+−-]/g, '').replace('−', '-'));

test('a batch re-aeration test set up in the editor, run by the worker and analysed on the run page', async ({ browser }) => {
	const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
	const page = await context.newPage();
	await signIn(page, ANALYST);
	await openNewCaseOfPilot(page);

	// without transfer the section holds the mode alone
	const section = page.getByTestId('section-transfer');
	await expect(section.getByTestId('field-transfer.mode')).toHaveValue('none');
	await expect(section.getByTestId('field-transfer.initialConcentrationKgM3')).toHaveCount(0);
	await expect(page.getByTestId('derived-surfaceSaturationKgM3')).toHaveCount(0);

	await page.getByTestId('field-name').fill(`E2E re-aeration ${Date.now().toString(36)}`);
	// 2 m of clean water at 20 °C in a 0.3 m column, 2.5 mm bubbles at 5 mm/s: a fine-bubble aeration test
	await page.getByTestId('field-geometry.heightM').fill('2.5');
	await page.getByTestId('field-geometry.diameterM').fill('0.3');
	await page.getByTestId('field-geometry.clearLiquidLevelM').fill('2');
	await page.getByTestId('field-sparging.superficialGasVelocityMS').fill('0.005');
	await page.getByTestId('field-bubbles.classes').selectOption('single');
	await page.getByTestId('field-bubbles.diameterM').fill('0.0025');
	await page.getByTestId('field-numerics.cells').fill('50');
	await page.getByTestId('field-numerics.endTimeS').fill('1200');
	await page.getByTestId('field-numerics.snapshotIntervalS').fill('5');
	await section.getByTestId('field-transfer.mode').selectOption('batch');
	await section.getByTestId('field-transfer.massTransferCoefficient').selectOption('frossling');
	await expect(section.getByTestId('field-transfer.initialConcentrationKgM3')).toBeVisible();
	// the liquid is not fed in a batch test
	await expect(section.getByTestId('field-transfer.inletConcentrationKgM3')).toHaveCount(0);
	await expect(section.getByTestId('field-transfer.dispersionM2S')).toHaveCount(0);
	await section.getByTestId('field-transfer.dispersion').selectOption('fixed');
	await expect(section.getByTestId('field-transfer.dispersionM2S')).toBeVisible();
	await section.getByTestId('field-transfer.dispersion').selectOption('deckwer');

	// Benson & Krause (1984): 9.09 mg/L of oxygen at 20 °C and 1 atm from water-saturated air (the ASCE/EWRI 2-06 table
	// value); at the sparger Henry's law scales it by (p_top + ρ g h − p_w)/(p_top − p_w) = 1.198 for 2 m of water
	const top = await number(page.getByTestId('derived-surfaceSaturationKgM3').textContent());
	const bottom = await number(page.getByTestId('derived-bottomSaturationKgM3').textContent());
	expect(Math.abs(top - 9.09)).toBeLessThan(0.01);
	expect(Math.abs(bottom / top - (101325 + 998.2 * 9.80665 * 2 - 2339) / (101325 - 2339))).toBeLessThan(0.002);
	// Deckwer et al. (1974): D_L = 0.678 D^1.4 U_G^0.3 (SI) = 0.678 · 0.3^1.4 · 0.00416^0.3 ≈ 0.022 m²/s (the sparger velocity)
	const dl = await number(page.getByTestId('derived-liquidDispersionM2S').textContent());
	expect(dl).toBeGreaterThan(0.018);
	expect(dl).toBeLessThan(0.026);
	await section.scrollIntoViewIfNeeded();
	await page.screenshot({ path: `${SHOTS}/transfer-10-case-editor.png` });

	firstRunId = await queueRun(page);
	caseUrl = (await page.locator('a[href^="/cases/"]').first().getAttribute('href'))!;

	// the transfer design numbers, each explaining itself
	for (const id of ['sotrKgH', 'sotePercent', 'sotePerMetrePercentM', 'apparentKLaPerS', 'effectiveSaturationDepthM', 'liquidDispersionM2S', 'wallHeatTransferWM2K']) {
		await expect(page.getByTestId(`design-${id}`)).toBeVisible();
	}
	await expect(page.getByTestId('run-closures')).toContainText('Frössling');
	// dissolved concentrations in mg/L, the unit of oxygen specifications; the same Benson & Krause 9.09 mg/L at the top
	await expect(page.getByTestId('design-surfaceSaturationKgM3')).toContainText('mg/L');
	expect(Math.abs((await number(page.getByTestId('design-surfaceSaturationKgM3').textContent())) - 9.09)).toBeLessThan(0.01);
	// the re-aeration analysis of the run's own series agrees with the model (solver test: fit within 1 % of its kLa)
	const check = page.getByTestId('run-reaeration-check');
	await expect(check).toBeVisible();
	const ratios = await check.locator('tbody tr td:nth-child(4)').allTextContents();
	expect(ratios).toHaveLength(6);
	const kla = Number(ratios[0]);
	expect(Math.abs(kla - 1)).toBeLessThan(0.01);
	expect(Math.abs(Number(ratios[4]) - 1)).toBeLessThan(0.01); // SOTR
	await expect(page.getByTestId('run-reaeration').getByTestId('reaeration-fit')).toContainText('kLa20');
	await page.getByTestId('run-reaeration').scrollIntoViewIfNeeded();
	await page.getByTestId('run-reaeration').screenshot({ path: `${SHOTS}/transfer-20-run-reaeration.png` });

	// the dissolved-oxygen profile against the saturation along the height
	await page.getByTestId('profile-field').selectOption('dissolvedConcentration');
	await expect(page.getByTestId('run-profile-chart')).toBeVisible();
	await page.screenshot({ path: `${SHOTS}/transfer-21-run-page.png`, fullPage: true });
	await page.getByTestId('design-numbers').screenshot({ path: `${SHOTS}/transfer-22-run-design.png` });
	await context.close();
});

test('the lead compares the rigid and the mobile interface and sees the transfer choice and its effect', async ({ browser }) => {
	expect(caseUrl).toMatch(/^\/cases\//);
	const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
	const analyst = await context.newPage();
	await signIn(analyst, ANALYST);
	await analyst.goto(caseUrl);
	await analyst.waitForLoadState('networkidle');
	await analyst.getByTestId('field-transfer.massTransferCoefficient').selectOption('higbie');
	const secondRunId = await queueRun(analyst);
	await context.close();

	const leadContext = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
	const lead = await leadContext.newPage();
	await signIn(lead, LEAD);
	await compareRuns(lead, { runIds: [firstRunId, secondRunId], name: 'C-101 k_L model check' });

	// the transfer choices are model choices like the closures: the one that differs is marked
	const differing = lead.getByTestId('closure-table').locator('tr[data-differs="true"]');
	await expect(differing).toHaveCount(1);
	await expect(differing).toContainText('Liquid-side k_L');
	await expect(differing).toContainText('Frössling (rigid interface)');
	await expect(differing).toContainText('Higbie penetration');
	await expect(lead.getByTestId('closure-table')).toContainText('Batch liquid (re-aeration test)');
	// a mobile interface transfers more (common practice: a factor of about 3–6 for millimetre bubbles, as the solver's
	// closure test states): the SOTR rises well above the rigid-interface baseline
	const delta = await lead.getByTestId('delta-sotrKgH-1').innerText();
	expect(delta.startsWith('+')).toBe(true);
	const pct = Number(delta.match(/\(\+([0-9.]+) %\)/)?.[1]);
	expect(pct).toBeGreaterThan(50);
	await expect(lead.getByTestId('compare-design')).toContainText('mg/L');
	await lead.screenshot({ path: `${SHOTS}/transfer-30-comparison.png`, fullPage: true });
	await leadContext.close();
});
