import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPassword, openE2eSession, type E2eSession } from './e2e-session';
import { DEMO_BENCHES } from '../../server/demo/demo-data';
import type { RunningStack } from '../../server/stack';
import { findValveType } from '../../shared/catalog/valve-types';
import type { QuickTestView } from '../../shared/hub/messages';
import { korenTriodeIa, type KorenTriodeParams } from '../../shared/physics/koren';

// Valve records, quick tests and nominal curves in the real product: hub, simulated tracers and
// bridges as processes, the built app in Chromium. `npm run test:e2e` builds the app first.
/** Simulated time runs this much faster: the 20 s warm-up and 60 s heater settle take 1 and 3 s. */
const SPEED = 20;

const BENCH_A = DEMO_BENCHES.find((b) => b.name === 'Bench A')!;
/** The type Bench A's simulated valve is (12AX7#1: seed 1 of the 12AX7 model). */
const TYPE = BENCH_A.valve.split('#')[0];
const NEW_LABEL = 'E2E-BOX-01';
/** The nominal curves' source as the admin names it; no spaces, so a wrapped legend still reads. */
const CURVE_SOURCE = 'E2E-sheet-from-Koren-1996';

/** Resolves with the first defined value of `check`; rejects naming `what` after `timeoutMs`. */
async function until<T>(what: string, check: () => Promise<T | undefined>, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

/**
 * A nominal-curve CSV of the type's published Koren triode model (Koren, Glass Audio 8(5), 1996;
 * parameters as in shared/catalog/valve-types.ts): Vg1 0 to -3 V, Va 0 to 300 V in 25 V steps.
 */
function korenCsv(): { csv: string; curves: number; points: number } {
  const model = findValveType(TYPE)!.model!;
  const params = model.params as KorenTriodeParams;
  const rows = ['va,vg1,ia'];
  const grids = [0, -1, -2, -3];
  for (const vg1 of grids) {
    for (let va = 0; va <= 300; va += 25) {
      rows.push(`${va},${vg1},${korenTriodeIa(params, va, vg1).toFixed(4)}`);
    }
  }
  return { csv: rows.join('\n') + '\n', curves: grids.length, points: rows.length - 1 };
}

describe('valve records, quick tests and nominal curves, end to end', () => {
  let stack: RunningStack;
  let browser: Browser;
  let session: E2eSession;
  let dataDir: string;
  let logs: string[] = [];
  let newValveId = 0;

  async function token(username: string): Promise<string> {
    const res = await fetch(`${stack.url}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ username, password: demoPassword(username) }),
    });
    return ((await res.json()) as { token: string }).token;
  }

  async function api<T>(path: string, bearer: string): Promise<T> {
    const res = await fetch(`${stack.url}${path}`, {
      headers: { authorization: `Bearer ${bearer}` },
    });
    if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`);
    return (await res.json()) as T;
  }

  const signIn = (page: Page, username: string) => session.signIn(page, username);

  /** Opens a page from the side navigation. */
  async function nav(page: Page, name: string): Promise<void> {
    await page.getByLabel('Pages').getByRole('link', { name, exact: true }).click();
  }

  /** Text of a locator with runs of white space as one space. */
  async function text(page: Page, selector: string): Promise<string> {
    return ((await page.locator(selector).first().textContent()) ?? '').replace(/\s+/g, ' ');
  }

  beforeAll(async () => {
    session = await openE2eSession('records', { speed: SPEED });
    ({ stack, browser, dataDir, logs } = session);
    // A quick test planned before the tracer names its optional functions would skip parts.
    await until('Bench A to announce its optional functions', async () =>
      logs.some((l) => l.startsWith('[bridge-a]') && l.includes('optional functions: '))
        ? true
        : undefined,
    );
  });

  afterAll(() => session?.close());

  it('lets a technician add a record, quick-test it on Bench A and read its grade and trend', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    await signIn(page, 'tech');

    await nav(page, 'Valves');
    await page.getByRole('button', { name: /New record/ }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Label').fill(NEW_LABEL);
    await dialog.getByRole('combobox', { name: 'Type' }).click({ force: true });
    await page.getByRole('option', { name: TYPE, exact: true }).click();
    await dialog.getByLabel('Maker as printed').fill('Harrowgate');
    await dialog.getByRole('button', { name: 'Add record' }).click();
    await page.waitForURL(/\/valves\/\d+$/);
    newValveId = Number(/\/valves\/(\d+)$/.exec(page.url())![1]);
    await page.getByRole('heading', { name: new RegExp(NEW_LABEL) }).waitFor();
    expect(await text(page, '.grade')).toContain('Not graded');
    expect(await text(page, 'app-valve-family')).toContain('No anode family of this valve yet.');

    await nav(page, 'Box check');
    await page.getByRole('combobox', { name: 'Bench' }).click({ force: true });
    await page.getByRole('option', { name: /Bench A/ }).click();
    await page.getByLabel('Valve label').fill(NEW_LABEL);
    await page.getByLabel('Valve label').press('Enter');
    await page.getByText(`${NEW_LABEL} is a ${TYPE}`).waitFor();
    await page.getByRole('button', { name: 'Test' }).click();

    const row = page.locator('table.results tbody tr').filter({ hasText: NEW_LABEL });
    await row.waitFor({ timeout: 60_000 });
    const cells = await row.locator('td').allTextContents();
    const boxGrade = cells[2].trim();
    const boxReason = cells[3].trim();
    expect(boxGrade).toMatch(/^(Strong|Fair|Weak)$/);
    // Graded by the lower of gm (against the data sheet) and emission (against the model).
    expect(boxReason).toMatch(/^(gm|emission) [\d.]+ % of (nominal|a sound valve's) /);

    await row.getByRole('link', { name: 'Record' }).click();
    await page.waitForURL(`**/valves/${newValveId}`);
    await until('the grade from the quick test', async () =>
      (await text(page, '.grade')).includes('From quick test') ? true : undefined,
    );
    const gradeText = await text(page, '.grade');
    expect(gradeText).toMatch(new RegExp(`^\\s*${boxGrade} · \\d+ %`));
    expect(gradeText).toContain(boxReason);

    // The trend chart holds the test's point: its summary names the hub's own figures.
    const [test] = (
      await api<{ items: QuickTestView[] }>(
        `/api/quick-tests?valveId=${newValveId}`,
        await token('tech'),
      )
    ).items;
    const gm = test.results.find((r) => r.part === 'gm')!.result;
    if (gm?.part !== 'gm') throw new Error('the quick test has no gm reading');
    const round = (x: number) => Math.round(x * 1000) / 1000;
    const trend = page.locator('app-valve-trend-chart [role=img]');
    expect(await trend.getAttribute('aria-label')).toBe(
      `Trend of gm and Ia over 0 sweeps and 1 quick test; newest gm ` +
        `${round(gm.measurement.gmMicrosiemens / 1000)} mA/V, ` +
        `Ia ${round(gm.measurement.iaMilliamps)} mA`,
    );
    expect(await trend.locator('svg text', { hasText: 'gm (mA/V)' }).count()).toBeGreaterThan(0);
    const tests = await text(page, 'app-valve-quick-tests table');
    expect(tests).toContain(boxReason);
    await page.close();
  });

  it('lets an admin upload nominal curves and see them over a sweep and on a valve record', async () => {
    const { csv, curves, points } = korenCsv();
    const file = join(dataDir, `${TYPE}-nominal.csv`);
    await writeFile(file, csv);
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, 'admin');

    await nav(page, 'Types');
    await page.getByRole('link', { name: TYPE, exact: true }).click();
    await page.waitForURL(`**/types/${TYPE}`);
    await page.getByLabel('Nominal-curve CSV').setInputFiles(file);
    const preview = page.getByLabel('Preview');
    await preview.waitFor();
    expect((await preview.textContent())?.replace(/\s+/g, ' ')).toContain(
      `${curves} curves, ${points} points. Nothing is saved yet.`,
    );
    await page.getByLabel('Source of the curves').fill(CURVE_SOURCE);
    await page.getByRole('button', { name: 'Save curves' }).click();
    await page.getByText(`Source: ${CURVE_SOURCE}. Uploaded`).waitFor();

    // The demo valve on Bench A has a saved sweep of this type.
    await nav(page, 'Valves');
    await page.getByRole('row', { name: `Open valve ${BENCH_A.label}` }).click();
    await page.waitForURL(/\/valves\/\d+$/);
    const family = page.locator('app-valve-family');
    await family.getByText(/Sweep #\d+ of/).waitFor();
    const note = family.locator('.nominal-note');
    await note.waitFor();
    const noteText = ((await note.textContent()) ?? '').replace(/\s+/g, ' ');
    expect(noteText).toContain(`the ${TYPE} nominal curves uploaded to the library`);
    expect(noteText).toContain(`Source: ${CURVE_SOURCE}. Uploaded`);
    expect(noteText).toContain('by admin');
    const legendOf = async () =>
      ((await family.locator('app-sweep-chart svg').textContent()) ?? '').replace(/\s+/g, '');
    await until('the uploaded curves in the record chart legend', async () =>
      (await legendOf()).includes(`Nominal(${CURVE_SOURCE})`) ? true : undefined,
    );
    const reference = family.getByRole('table', { name: /Measured against nominal at Va 250 V/ });
    const gmCells = await reference
      .locator('tbody tr')
      .filter({ hasText: 'gm (mA/V)' })
      .locator('th, td')
      .allTextContents();
    // Nominal gm 1.6 mA/V: the 12AX7's reference point (RCA data sheet) in the type library.
    expect(gmCells.map((c) => c.trim())).toEqual([
      'gm (mA/V)',
      expect.stringMatching(/^\d\.\d+$/),
      '1.6',
      expect.stringMatching(/^\d+ %$/),
    ]);
    expect(await text(page, 'app-valve-family')).toContain('On the uploaded nominal curve: Ia');

    await page.getByRole('switch', { name: 'Show nominal' }).click();
    await until('the nominal curves to leave the legend', async () =>
      (await legendOf()).includes('Nominal(') ? undefined : true,
    );

    // The same curves over the saved sweep on its own page.
    await family.getByRole('link', { name: /^#\d+$/ }).click();
    await page.waitForURL(/\/sweeps\/\d+$/);
    const sweepNote = page.locator('.nominal-note');
    await sweepNote.waitFor();
    expect(((await sweepNote.textContent()) ?? '').replace(/\s+/g, ' ')).toContain(
      `the ${TYPE} nominal curves uploaded to the library. Source: ${CURVE_SOURCE}.`,
    );
    await until('the uploaded curves in the sweep chart legend', async () =>
      ((await page.locator('app-sweep-chart svg').first().textContent()) ?? '')
        .replace(/\s+/g, '')
        .includes(`Nominal(${CURVE_SOURCE})`)
        ? true
        : undefined,
    );
    await page.close();
  });

  it('lets an admin delete the record after naming its label', async () => {
    expect(newValveId).toBeGreaterThan(0);
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, 'admin');
    await page.goto(`${stack.url}/valves/${newValveId}`);
    await page.getByRole('button', { name: 'Delete record' }).click();
    const dialog = page.getByRole('dialog');
    expect(await dialog.getByRole('heading').textContent()).toBe(`Delete ${NEW_LABEL}?`);
    await dialog.getByRole('button', { name: `Delete ${NEW_LABEL}` }).click();
    await page.waitForURL(/\/valves$/);
    const res = await fetch(`${stack.url}/api/valves/${newValveId}`, {
      headers: { authorization: `Bearer ${await token('admin')}` },
    });
    expect(res.status).toBe(404);
    await page.close();
  });
});
