/** Debian's Chromium driven by playwright-core, against the real app on a loopback port. */
import fs from 'node:fs';
import { createRequire } from 'node:module';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { type Browser, type BrowserContext, chromium, type Page } from 'playwright-core';
import { seedDemo } from '../../db/seed/seed';
import { defaultClientDir } from '../../server/app';
import { freePort } from '../../db/pg-server';
import { publish } from '../../server/results/results-service';
import { createTestApp, mintSessionCookie, type TestApp, type TestUser } from './test-app';

export const screenshotDir = path.resolve('.test-artifacts', 'screenshots');

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
    // Playwright gives each launch a new empty profile folder of its own.
  });
}

export interface LiveApp extends TestApp {
  url: string;
  stop(): Promise<void>;
}

/** The built client and the API, listening on 127.0.0.1 like `npm start`. */
export async function startLiveApp(): Promise<LiveApp> {
  if (!fs.existsSync(path.join(defaultClientDir, 'index.html'))) {
    throw new Error(
      'The client is not built: run `npm test` (it builds first) or `npx vite build`.',
    );
  }
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const t = await createTestApp({ clientDir: defaultClientDir, baseUrl: url, port });
  const server = await new Promise<import('node:http').Server>((resolve) => {
    const s = t.app.listen(port, '127.0.0.1', () => resolve(s));
  });
  if ((server.address() as AddressInfo).port !== port) throw new Error('port mismatch');
  return {
    ...t,
    url,
    async stop() {
      await new Promise((r) => server.close(r));
      server.closeAllConnections?.();
      await t.close();
    },
  };
}

/** A browser context already signed in as `user` (session minted on the server, no form). */
export async function contextAs(
  browser: Browser,
  live: LiveApp,
  user: Pick<TestUser, 'email' | 'password'> | null,
  viewport = { width: 1280, height: 900 },
  // The app's service worker would sit between the page and Playwright's network controls;
  // only the offline-shell test lets it run.
  serviceWorkers: 'allow' | 'block' = 'block',
  // Phones draw 2–3 device pixels per CSS pixel; a test that reads fine print from a screenshot
  // (a QR code's modules) asks for that density.
  deviceScaleFactor = 1,
): Promise<BrowserContext> {
  const context = await browser.newContext({
    viewport,
    baseURL: live.url,
    serviceWorkers,
    deviceScaleFactor,
  });
  // Two cores run the whole suite at once: give pages room before a wait counts as a failure.
  context.setDefaultTimeout(60_000);
  if (user) {
    const [name, value] = (await mintSessionCookie(live, user)).split('=');
    await context.addCookies([
      { name: name!, value: value!, url: live.url, httpOnly: true, sameSite: 'Lax' },
    ]);
  }
  return context;
}

/** Collects page errors and console errors so a test can assert there were none. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(m.text());
  });
  return errors;
}

export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(screenshotDir, { recursive: true });
  const file = path.join(screenshotDir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** The live app (with the demo season loaded if asked) and a browser, for one test file. */
export async function openBrowserSuite(opts: {
  demo: boolean;
}): Promise<{ live: LiveApp; browser: Browser }> {
  const live = await startLiveApp();
  if (opts.demo) await seedDemo(live.db);
  return { live, browser: await launchBrowser() };
}

/** Publishes a version of the trial's results sheet on the live app, as the user with this e-mail. */
export async function publishAs(live: LiveApp, email: string, slug: string, changeNote = '') {
  const { id } = await live.db
    .selectFrom('users')
    .select('id')
    .where('email', '=', email)
    .executeTakeFirstOrThrow();
  return publish(
    { db: live.db, mail: live.runtime.mail, baseUrl: live.url },
    slug,
    { userId: id, isAdmin: false },
    changeNote,
  );
}

export async function closeBrowserSuite(
  live: LiveApp | undefined,
  browser: Browser | undefined,
): Promise<void> {
  await browser?.close();
  await live?.stop();
}

// axe-core's engine, injected into a page by evaluation (Playwright's evaluate is not subject to
// the app's Content-Security-Policy, which refuses inline scripts).
const axeSource = fs.readFileSync(
  createRequire(import.meta.url).resolve('axe-core/axe.min.js'),
  'utf8',
);

interface AxeViolation {
  id: string;
  impact?: string | null;
  help: string;
  helpUrl: string;
  nodes: { target: unknown[]; failureSummary?: string }[];
}

/**
 * Runs axe-core's WCAG 2.x A/AA rules and its best practices on the page as it is now and fails
 * on any violation that axe rates serious or critical, listing each rule with the elements it hit.
 */
export async function expectNoSeriousA11yViolations(page: Page, where = page.url()): Promise<void> {
  const loaded = await page.evaluate(() => 'axe' in window);
  if (!loaded) await page.evaluate(axeSource);
  const violations = (await page.evaluate(async () => {
    const axe = (
      window as unknown as {
        axe: { run: (c: Document, o: object) => Promise<{ violations: unknown[] }> };
      }
    ).axe;
    const result = await axe.run(document, { resultTypes: ['violations'] });
    return result.violations;
  })) as AxeViolation[];
  const serious = violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  if (serious.length === 0) return;
  const list = serious
    .map((v) => {
      const targets = v.nodes
        .slice(0, 5)
        .map((n) => `    - ${n.target.map(String).join(' ')}`)
        .join('\n');
      const more = v.nodes.length > 5 ? `\n    … and ${v.nodes.length - 5} more` : '';
      return `  [${v.impact}] ${v.id}: ${v.help} (${v.nodes.length} element(s))\n${targets}${more}`;
    })
    .join('\n');
  throw new Error(
    `Accessibility: ${serious.length} serious or critical rule(s) broken on ${where}\n${list}`,
  );
}
