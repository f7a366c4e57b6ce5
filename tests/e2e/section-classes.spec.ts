/**
 * Bubble classes across the section, in a real browser against the built app and a real worker: the analyst sets
 * up a churn-turbulent cross-section, the editor's Bubble classes section shows the transition and the division of
 * the gas, and the run page shows each class's holdup, which the lift's sign change puts at the wall (small) and in
 * the core (large). Screenshots go to artifacts/screenshots (git-ignored). Its name sorts after demo-work.spec.ts,
 * which seeds the demo work only while the pilot column C-101 has no cases.
 */
import { expect, test } from '@playwright/test';
import { compareRuns, openNewCaseOfPilot, queueRun, ANALYST, LEAD, SHOTS, signIn } from './demo';
import { riquartsCentrelineVelocityMS } from '../../solver/correlations/circulation';

test.describe.configure({ mode: 'serial', timeout: 240_000 });

let caseUrl = '';
let classesRunId = '';

const number = async (text: Promise<string | null>) => Number((await text)?.replace(/[^0-9.eE+−-]/g, '').replace('−', '-'));

test('a churn-turbulent cross-section with small and large bubbles, set up in the editor and run by the worker', async ({ browser }) => {
	const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
	const page = await context.newPage();
	await signIn(page, ANALYST);
	await openNewCaseOfPilot(page);
	await page.getByTestId('kind-cross-section').check({ force: true });
	await page.getByTestId('field-name').fill(`E2E section classes ${Date.now().toString(36)}`);
	// air–water in a 0.3 m column at 0.2 m/s: well above the transition
	await page.getByTestId('field-geometry.diameterM').fill('0.3');
	await page.getByTestId('field-sparging.superficialGasVelocityMS').fill('0.2');
	await page.getByTestId('field-numerics.cells').fill('60');
	await page.getByTestId('field-numerics.endTimeS').fill('120');
	const section = page.getByTestId('section-bubbles');
	await expect(section.getByTestId('field-bubbles.classes')).toHaveValue('small-large');
	await expect(section.getByTestId('field-bubbles.largeDrag')).toBeVisible();
	// Reilly et al. (1994) for air–water at about 1.2 kg/m³: U_trans a few cm/s, so most of 0.2 m/s rises as large bubbles
	const uTrans = await number(page.getByTestId('derived-transitionVelocityMS').textContent());
	expect(uTrans).toBeGreaterThan(0.02);
	expect(uTrans).toBeLessThan(0.06);
	const share = await number(page.getByTestId('derived-largeGasShare').textContent());
	expect(Math.abs(share - 100 * (1 - uTrans / 0.2))).toBeLessThan(2);
	// the size classes are a height-profile model: chosen here, the form names the field
	await section.getByTestId('field-bubbles.classes').selectOption('size-classes');
	await expect(page.getByText('Size classes are computed by the height-profile model only')).toBeVisible();
	await section.getByTestId('field-bubbles.classes').selectOption('small-large');
	await section.scrollIntoViewIfNeeded();
	await page.screenshot({ path: `${SHOTS}/section-classes-10-case-editor.png` });

	classesRunId = await queueRun(page);
	caseUrl = (await page.locator('a[href^="/cases/"]').first().getAttribute('href'))!;

	// solver test: 0.3 m at 0.2 m/s gives a section holdup of 0.20 (the correlations' mean 0.23), small bubbles at
	// the wall, large ones in the core, and a centreline velocity 1.1 times Riquarts (1981)
	const holdup = await number(page.getByTestId('design-sectionHoldup').textContent());
	expect(holdup).toBeGreaterThan(0.16);
	expect(holdup).toBeLessThan(0.3);
	await expect(page.getByTestId('design-peakLocationSmall')).toContainText('wall-peaked');
	await expect(page.getByTestId('design-peakLocationLarge')).toContainText('core-peaked');
	await expect(page.getByTestId('design-peakLocation')).toContainText('core-peaked');
	const small = await number(page.getByTestId('design-sectionHoldupSmall').textContent());
	const large = await number(page.getByTestId('design-sectionHoldupLarge').textContent());
	expect(Math.abs(small + large - holdup)).toBeLessThan(0.002);
	const uc = await number(page.getByTestId('design-centrelineLiquidVelocityMS').textContent());
	const riquarts = riquartsCentrelineVelocityMS({ diameterM: 0.3, superficialGasVelocityMS: 0.2, liquidKinematicViscosityM2S: 1.002e-3 / 998.2 });
	expect(Math.abs(uc / riquarts - 1)).toBeLessThan(0.3);

	// each class's holdup across the radius is among the profiles
	const select = page.getByTestId('profile-field');
	await select.selectOption('holdupLarge');
	await expect(page.getByTestId('run-profile-chart')).toBeVisible();
	await page.getByTestId('run-profile-chart').scrollIntoViewIfNeeded();
	await page.screenshot({ path: `${SHOTS}/section-classes-20-run-large.png` });
	await select.selectOption('holdupSmall');
	await page.screenshot({ path: `${SHOTS}/section-classes-21-run-small.png` });
	await page.getByTestId('run-closures').scrollIntoViewIfNeeded();
	await page.screenshot({ path: `${SHOTS}/section-classes-30-run-numbers.png`, fullPage: true });
	await context.close();
});

test('one bubble size fails in churn-turbulent flow, and the lead compares the classes with and without lift', async ({ browser }) => {
	expect(caseUrl).toMatch(/^\/cases\//);
	const context = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
	const analyst = await context.newPage();
	await signIn(analyst, ANALYST);
	await analyst.goto(caseUrl);
	await analyst.waitForLoadState('networkidle');
	// the same 0.2 m/s with one 5 mm size: the slow bubbles pile up until the holdup limit (the gap the classes close)
	await analyst.getByTestId('field-bubbles.classes').selectOption('single');
	await queueRun(analyst, 'failed');
	await expect(analyst.getByTestId('run-progress')).toContainText(/Gas holdup 0\.8\d* in cell/);
	// the progress line says how far the run went, not the 0 steps it had when the page opened
	expect(Number(await analyst.getByTestId('step-count').innerText())).toBeGreaterThan(10);
	await analyst.getByTestId('run-progress').screenshot({ path: `${SHOTS}/section-classes-35-one-size-fails.png` });

	// back to the classes, without lift: nothing separates them, so nothing drives the circulation
	await analyst.goto(caseUrl);
	await analyst.waitForLoadState('networkidle');
	await analyst.getByTestId('field-bubbles.classes').selectOption('small-large');
	await analyst.getByTestId('field-closures.lift').selectOption('none');
	const noLiftRunId = await queueRun(analyst);
	await context.close();

	const leadContext = await browser.newContext({ viewport: { width: 1400, height: 1000 } });
	const lead = await leadContext.newPage();
	await signIn(lead, LEAD);
	await compareRuns(lead, { runIds: [classesRunId, noLiftRunId], name: 'C-101 section: lift on the bubble classes' });
	const differing = lead.getByTestId('closure-table').locator('tr[data-differs="true"]');
	await expect(differing).toHaveCount(1);
	await expect(differing).toContainText('Lift');
	// solver: 0.93 m/s on the axis with Tomiyama's lift, 0.006 m/s without (the classes stay mixed)
	const delta = await lead.getByTestId('delta-centrelineLiquidVelocityMS-1').innerText();
	expect(delta.startsWith('−') || delta.startsWith('-')).toBe(true);
	await expect(lead.getByTestId('compare-design')).toContainText('Section-average holdup of the large bubbles');
	await lead.screenshot({ path: `${SHOTS}/section-classes-40-comparison.png`, fullPage: true });
	await leadContext.close();
});
