import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { DEMO_USERS } from '../../server/demo/demo-data';
import { startStack, type RunningStack, type StackOptions } from '../../server/stack';

/** The built app the hub serves; `npm run test:e2e` builds it first. */
const APP_INDEX = join(process.cwd(), 'dist/emberline/browser/index.html');

/** Debian's Chromium, headless, without the background traffic a test has no use for. */
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

/** The whole product in real processes and a real browser, for one test file. */
export interface E2eSession {
  stack: RunningStack;
  browser: Browser;
  /** Temporary DATA_DIR of the hub (removed by close). */
  dataDir: string;
  /** Every line the stack's processes printed. */
  logs: string[];
  /** Signs a demo user in on a page and waits for the bench page. */
  signIn(page: Page, username: string): Promise<void>;
  /** Closes the browser, stops the stack (bridges first) and removes the data; E2E_LOGS prints. */
  close(): Promise<void>;
}

/** The password of a demo user. */
export function demoPassword(username: string): string {
  const user = DEMO_USERS.find((u) => u.username === username);
  if (!user) throw new Error(`no demo user ${username}`);
  return user.password;
}

/**
 * Starts hub, simulated tracers and bridges on free ports with a temporary DATA_DIR (the mail
 * server on a free port too), and Chromium; `name` marks the data folder.
 */
export async function openE2eSession(
  name: string,
  options: Omit<StackOptions, 'port' | 'dataDir' | 'log'> = {},
): Promise<E2eSession> {
  if (!existsSync(APP_INDEX)) {
    throw new Error(`${APP_INDEX} is missing: run "npx ng build" (npm run test:e2e does) first`);
  }
  const dataDir = await mkdtemp(join(tmpdir(), `emberline-e2e-${name}-`));
  const logs: string[] = [];
  const stack = await startStack({ port: 0, dataDir, log: (line) => logs.push(line), ...options });
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: CHROMIUM_ARGS,
  });
  return {
    stack,
    browser,
    dataDir,
    logs,
    async signIn(page, username) {
      await page.goto(`${stack.url}/sign-in`);
      await page.getByLabel('User name').fill(username);
      await page.getByLabel('Password').fill(demoPassword(username));
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL('**/bench');
    },
    async close() {
      await browser.close();
      await stack.stop();
      await rm(dataDir, { recursive: true, force: true });
      if (process.env.E2E_LOGS) console.log(logs.join('\n'));
    },
  };
}
