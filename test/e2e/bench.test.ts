import { readFile } from 'node:fs/promises';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openE2eSession, type E2eSession } from './e2e-session';
import { defaultPlan, findValveType } from '../../shared/catalog/valve-types';
import { CSV_HEADER } from '../../server/sweeps/sweep-export';

// The whole product in real processes (hub, simulated tracers, bridges) and the built app in a
// real browser. `npm run test:e2e` builds the app first.
describe('the bench, end to end', () => {
  let browser: Browser;
  let session: E2eSession;
  let sweepId = 0;

  const signIn = (page: Page, username: string) => session.signIn(page, username);

  beforeAll(async () => {
    session = await openE2eSession('bench', { speed: 1 });
    ({ browser } = session);
  });

  afterAll(() => session?.close());

  it('lets a technician run a 12AX7 sweep on Bench A and watch its curves arrive', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    await signIn(page, 'tech');
    await expect
      .poll(() => page.getByRole('radio', { name: /Bench A/ }).textContent())
      .toMatch(/Idle/);
    await page.getByRole('radio', { name: /Bench A/ }).click();

    // The select's floating label sits over its trigger; a person clicks either.
    await page.getByRole('combobox', { name: 'Valve type' }).click({ force: true });
    await page.getByRole('option', { name: /^12AX7/ }).click();
    await page.getByLabel('Valve label').fill('e2e shelf 1');
    await page.getByLabel('Warm-up').fill('2');
    await page.getByRole('button', { name: /Start sweep/ }).click();

    const dialog = page.getByRole('dialog');
    await expect.poll(() => dialog.textContent()).toContain('Up to 300 V on the anode');
    await dialog.getByRole('button', { name: /Apply voltages and start/ }).click();

    const banner = page.getByRole('alert').filter({ hasText: 'HIGH VOLTAGE LIVE' });
    await banner.waitFor({ timeout: 30_000 });
    expect(await banner.textContent()).toContain('Bench A');
    await page.getByRole('button', { name: /Abort sweep/ }).waitFor();

    // Curves are drawn while points arrive: several legend entries, one per Vg1 step.
    const chart = page.locator('app-sweep-chart svg');
    await expect
      .poll(async () => await chart.locator('text', { hasText: /^Vg1 = / }).count(), {
        timeout: 30_000,
      })
      .toBeGreaterThanOrEqual(3);

    await page.getByText('Every curve was measured.').waitFor({ timeout: 90_000 });
    await banner.waitFor({ state: 'detached', timeout: 15_000 });
    const title = await page.locator('app-live-sweep h2').textContent();
    sweepId = Number(/#(\d+)/.exec(title ?? '')?.[1]);
    expect(sweepId).toBeGreaterThan(0);
    // Every curve of the type's default plan is on the chart, down to the most negative grid.
    const lastGrid = defaultPlan(findValveType('12AX7')!).vg1Volts.at(-1);
    expect(await chart.locator('text', { hasText: `Vg1 = ${lastGrid} V` }).count()).toBe(1);
    await page.close();
  });

  it('shows the finished sweep on the sweeps page and downloads it as CSV', async () => {
    expect(sweepId).toBeGreaterThan(0);
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    await signIn(page, 'tech');
    await page.getByRole('link', { name: 'Sweeps' }).click();
    const row = page.getByRole('row', { name: `Open sweep ${sweepId}` });
    await row.waitFor();
    expect(await row.textContent()).toContain('Complete');
    await row.click();
    await page.waitForURL(`**/sweeps/${sweepId}`);
    await page.getByRole('heading', { name: new RegExp(`Sweep #${sweepId} · 12AX7`) }).waitFor();
    await expect
      .poll(() => page.locator('app-sweep-chart svg text', { hasText: 'Vg1 = 0 V' }).count())
      .toBe(1);

    const downloading = page.waitForEvent('download');
    await page.getByRole('button', { name: 'CSV' }).click();
    const download = await downloading;
    expect(download.suggestedFilename()).toBe(`sweep-${sweepId}.csv`);
    const lines = (await readFile(await download.path(), 'utf8')).trim().split(/\r?\n/);
    const rows = lines.filter((l) => !l.startsWith('#'));
    expect(rows[0]).toBe(CSV_HEADER);
    expect(rows.length - 1).toBeGreaterThan(100);
    expect(lines).toContain('# valve label: e2e shelf 1');
    await page.close();
  });

  it('gives a viewer the live view without a plan form or an abort', async () => {
    const page = await browser.newPage({ viewport: { width: 1024, height: 768 } });
    await signIn(page, 'viewer');
    await page.locator('app-live-sweep').waitFor();
    expect(await page.locator('app-sweep-plan-form').count()).toBe(0);
    expect(await page.getByRole('button', { name: /Start sweep/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Abort sweep/ }).count()).toBe(0);
    await page.close();
  });
});
