import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openE2eSession, type E2eSession } from './e2e-session';
import type { RunningStack } from '../../server/stack';

// Matching the demo stock into a quad, reserving it and sending its report, in the built app
// against the real stack. `npm run test:e2e` builds the app first.
const BUYER = 'quad.buyer@example.com';

describe('matching, end to end', () => {
  let stack: RunningStack;
  let browser: Browser;
  let session: E2eSession;
  let setUrl = '';
  let setCode = '';
  let quad: string[] = [];
  let runUrl = '';

  const signIn = (page: Page, username: string) => session.signIn(page, username);

  beforeAll(async () => {
    // The development mail server gets a free port of its own: the outbox shows what it received.
    session = await openE2eSession('matching', { speed: 1 });
    ({ stack, browser } = session);
  });

  afterAll(() => session?.close());

  it('groups the EL34 stock into quads and overlays the curves of the chosen one', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, 'tech');
    await page.getByRole('link', { name: 'Matching' }).click();
    await page.waitForURL('**/matching');
    await page.getByRole('combobox', { name: 'Valve type' }).click({ force: true });
    await page.getByRole('option', { name: /^EL34/ }).click();
    // The idle point comes from the type's published operating point.
    expect(await page.locator('[formcontrolname="idleVaVolts"]').inputValue()).toBe('250');
    expect(await page.locator('[formcontrolname="idleVg1Volts"]').inputValue()).toBe('-13.5');
    await page.getByRole('radio', { name: 'Quad (4)' }).click();
    await page.getByRole('button', { name: /Run matching/ }).click();

    await page.waitForURL(/\/matching\?run=\d+$/);
    runUrl = page.url();
    const first = page.locator('li.group').first();
    await first.getByText('Quad 1').waitFor();
    quad = await first.locator('.members a').allTextContents();
    expect(quad).toHaveLength(4);
    expect(new Set(quad).size).toBe(4);
    expect(await first.locator('.verdict').textContent()).toMatch(/Within 5 %/);

    await page.getByRole('heading', { name: 'Quad 1: anode curves' }).waitFor();
    const legend = page.locator('app-member-curves svg text');
    await expect
      .poll(async () => (await legend.allTextContents()).filter((t) => /^KL-\d{4}$/.test(t)), {
        timeout: 15_000,
      })
      .toEqual(quad);

    // A reload brings the same run back from the address.
    await page.reload();
    await page.locator('li.group').first().getByText('Quad 1').waitFor();
    expect(await page.locator('li.group').first().locator('.members a').allTextContents()).toEqual(
      quad,
    );
    await page.close();
  });

  it('reserves the quad, whose page shows the set and its valves reserved', async () => {
    expect(runUrl).not.toBe('');
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, 'tech');
    await page.goto(runUrl);
    await page.locator('li.group').first().getByText('Quad 1').waitFor();
    expect(await page.locator('li.group').first().locator('.members a').allTextContents()).toEqual(
      quad,
    );
    await page.getByRole('button', { name: 'Reserve this quad' }).click();

    await page.waitForURL(/\/match-sets\/\d+$/);
    setUrl = page.url();
    setCode = (await page.locator('h1 .readout').textContent())!.trim();
    expect(setCode).toMatch(/^MS-\d{4}$/);
    expect(await page.locator('h1 app-match-set-status-chip').textContent()).toMatch(/Reserved/);
    const rows = page.locator('table.members tbody tr');
    await expect.poll(() => rows.count()).toBe(4);
    for (let i = 0; i < 4; i++) {
      const cells = rows.nth(i).locator('td');
      expect((await cells.nth(0).textContent())!.trim()).toBe(quad[i]);
      expect((await cells.nth(2).textContent())!.trim()).toBe('Reserved');
    }

    // The valve record agrees, and a second reservation of the same group is refused clearly.
    await rows.nth(0).locator('td').nth(0).locator('a').click();
    await page.waitForURL(/\/valves\/\d+$/);
    await page.getByRole('heading', { name: new RegExp(quad[0]) }).waitFor();
    await page.goto(runUrl);
    await page.getByRole('button', { name: 'Reserve this quad' }).click();
    const refusal = page.locator('.curves-panel p.error');
    await refusal.waitFor();
    expect(await refusal.textContent()).toContain(`Not reserved: ${quad[0]} is reserved`);
    await page.close();
  });

  it('sends the report to a buyer and lists the mailing on the set', async () => {
    expect(setUrl).not.toBe('');
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, 'tech');
    // The set is on the list of sets, newest first.
    await page.getByRole('link', { name: 'Match sets' }).click();
    await page.getByRole('row', { name: `Open set ${setCode}` }).click();
    await page.waitForURL(setUrl);
    await page.getByRole('button', { name: 'Send report' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Buyer’s e-mail').fill(BUYER);
    await dialog.getByRole('button', { name: 'Send report' }).click();
    await dialog.waitFor({ state: 'detached', timeout: 30_000 });
    await page
      .getByRole('status')
      .filter({ hasText: `Report sent to ${BUYER}.` })
      .waitFor();
    const mailings = page.getByRole('list', { name: 'Report mailings' });
    await mailings.waitFor();
    expect(await mailings.textContent()).toContain(BUYER);
    await page.close();
  });

  it('shows the admin the report message in the outbox with its PDF attached', async () => {
    expect(setCode).not.toBe('');
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, 'admin');
    await page.goto(`${stack.url}/outbox`);
    const message = page.locator('li.message').filter({ hasText: setCode });
    await message.first().waitFor({ timeout: 15_000 });
    expect(await message.first().textContent()).toContain(BUYER);
    const attachment = message.first().getByRole('button', { name: /Download .*\.pdf/ });
    expect(await attachment.textContent()).toContain(`match-report-${setCode}.pdf`);
    await page.close();
  });

  it('opens a buyer link in a signed-out browser and shows the report', async () => {
    expect(setUrl).not.toBe('');
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, 'tech');
    await page.goto(setUrl);
    await page.getByLabel('Expires after').fill('7');
    await page.getByRole('button', { name: /Make a buyer link/ }).click();
    const link = page.getByLabel('New buyer link', { exact: true });
    await link.waitFor();
    const url = (await link.textContent())!.trim();
    expect(url).toMatch(/\/shared\/[\w-]{16,}$/);
    await page
      .getByRole('list', { name: 'Buyer links' })
      .getByText(/valid until/)
      .waitFor();
    await page.close();

    const buyer = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const view = await buyer.newPage();
    await view.goto(url);
    const report = view.getByRole('article', { name: `Match report ${setCode}` });
    await report.waitFor({ timeout: 15_000 });
    const text = (await report.textContent()) ?? '';
    for (const label of quad) expect(text).toContain(label);
    // No session in the buyer's browser: the link alone opened the report.
    expect(await view.evaluate('window.localStorage.length')).toBe(0);
    await buyer.close();
  });
});
