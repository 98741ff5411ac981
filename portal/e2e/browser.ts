import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Locator, type Page, type Response } from 'playwright-core';
import { afterEach, beforeEach, expect } from 'vitest';
import { DEMO_PASSWORD, PEOPLE } from '@localis/seeds/scenario';

/**
 * Helpers of the browser suite: Debian's Chromium driven by playwright-core, one fresh profile
 * per test (so neither the portal's nor the identity provider's cookies leak between roles),
 * the real OIDC sign-in, screenshots, and a watch on console errors and failed requests.
 */

export const PUBLIC_URL = (process.env.PUBLIC_URL ?? 'http://127.0.0.1:4200').replace(/\/$/, '');
export const OIDC_ISSUER = (process.env.OIDC_ISSUER ?? 'http://127.0.0.1:9401').replace(/\/$/, '');
export const DATA_DIR = process.env.DATA_DIR ?? join(process.cwd(), '.data', 'test');
export const MAIL_INBOX_URL = `http://127.0.0.1:${process.env.MAIL_INBOX_PORT ?? '1081'}`;
export const SCREENSHOT_DIR = join(DATA_DIR, 'screenshots');

const PORTAL_ORIGIN = new URL(PUBLIC_URL).origin;
const PROVIDER_ORIGIN = new URL(OIDC_ISSUER).origin;

/** Flags from STACK.md: without the background-networking ones Chromium floods the closed network. */
const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export const DEFAULT_VIEWPORT = { width: 1280, height: 800 };

/** A demo person by e-mail, so names come from the scenario and not from the tests. */
export function demoPerson(email: string) {
  const person = PEOPLE.find((p) => p.email === email);
  if (!person) throw new Error(`${email} is not a demo person`);
  return person;
}

interface ExpectedFailure {
  url: RegExp;
  status?: number;
}

/** What went wrong in the browser that no test step asked for. */
class ProblemLog {
  readonly problems: string[] = [];
  private readonly expected: ExpectedFailure[] = [];

  expect(url: RegExp, status?: number): void {
    this.expected.push({ url, status });
  }

  isExpected(url: string, status?: number): boolean {
    return this.expected.some((e) => e.url.test(url) && (e.status === undefined || e.status === status));
  }

  add(problem: string): void {
    this.problems.push(problem);
  }
}

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Marks a failing request as one the test provokes on purpose (the URL pattern, and the status). */
  expectFailure(url: RegExp, status?: number): void;
  close(): Promise<void>;
}

const logs = new WeakMap<BrowserContext, ProblemLog>();

function watch(context: BrowserContext, log: ProblemLog): void {
  context.on('console', (msg) => {
    if (msg.type() !== 'error') return;
    const text = msg.text();
    // Chromium repeats every failed load as a console error; the response and requestfailed
    // listeners already judge those, with the expected ones left out.
    if (text.startsWith('Failed to load resource')) return;
    log.add(`console error on ${msg.page()?.url() ?? '?'}: ${text}`);
  });
  context.on('weberror', (error) => log.add(`uncaught error on ${error.page()?.url() ?? '?'}: ${error.error().message}`));
  context.on('response', (response: Response) => {
    const status = response.status();
    if (status < 400 || log.isExpected(response.url(), status)) return;
    log.add(`HTTP ${status} ${response.request().method()} ${response.url()}`);
  });
  context.on('requestfailed', (request) => {
    const reason = request.failure()?.errorText ?? 'failed';
    // A navigation cancels what the old page still had in flight; that is the browser's doing.
    if (reason === 'net::ERR_ABORTED' || log.isExpected(request.url())) return;
    log.add(`request failed (${reason}) ${request.method()} ${request.url()}`);
  });
}

/**
 * Runs in every page before its own scripts: an error toast is how the portal shows a failure
 * nobody else sees (a request that went wrong in its own code), so it is logged as a console
 * error, which the watch above counts.
 */
function reportErrorToasts(): void {
  const seen = new WeakSet<Element>();
  const check = () => {
    for (const el of Array.from(document.querySelectorAll('.p-toast-message-error'))) {
      if (seen.has(el)) continue;
      seen.add(el);
      // Read once rendered: the summary and detail arrive with the element, as separate blocks.
      requestAnimationFrame(() => console.error(`[error toast] ${(el as HTMLElement).innerText.replace(/\s+/g, ' ').trim()}`));
    }
  };
  const start = () => new MutationObserver(check).observe(document.documentElement, { childList: true, subtree: true });
  if (document.documentElement) start();
  else document.addEventListener('DOMContentLoaded', start);
}

/** A fresh Chromium profile with its own cookies, watched for errors. */
export async function openBrowser(options: { viewport?: { width: number; height: number } } = {}): Promise<BrowserSession> {
  const profileDir = mkdtempSync(join(tmpdir(), 'localis-e2e-'));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: options.viewport ?? DEFAULT_VIEWPORT,
    locale: 'en-GB',
    timezoneId: 'Europe/Berlin',
  });
  context.setDefaultTimeout(10_000);
  context.setDefaultNavigationTimeout(15_000);
  const log = new ProblemLog();
  logs.set(context, log);
  watch(context, log);
  await context.addInitScript(reportErrorToasts);
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    expectFailure: (url, status) => log.expect(url, status),
    close: async () => {
      await context.close().catch(() => undefined);
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

export function problemsOf(context: BrowserContext): string[] {
  return logs.get(context)?.problems ?? [];
}

/**
 * One fresh browser per test: opened before it, closed after it. A failed test leaves a
 * screenshot named after it; a test after which the browser logged unexpected errors fails.
 */
export function useBrowser(options: { viewport?: { width: number; height: number } } = {}) {
  let session: BrowserSession | null = null;

  beforeEach(async () => {
    session = await openBrowser(options);
  });

  afterEach(async (ctx) => {
    const current = session;
    session = null;
    if (!current) return;
    if (ctx.task.result?.state === 'fail') {
      await screenshot(current.page, `failed-${slug(ctx.task.name)}`).catch(() => undefined);
    }
    const problems = [...problemsOf(current.context)];
    await current.close();
    expect(problems, 'unexpected console errors or failed requests').toEqual([]);
  });

  return {
    get page(): Page {
      if (!session) throw new Error('the browser is only open inside a test');
      return session.page;
    },
    get session(): BrowserSession {
      if (!session) throw new Error('the browser is only open inside a test');
      return session;
    },
  };
}

function slug(text: string): string {
  return text.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 80);
}

/** Saves a full-page screenshot to `${DATA_DIR}/screenshots/<name>.png` and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const path = join(SCREENSHOT_DIR, `${name}.png`);
  // Let fonts, requests and enter transitions (dialog masks, toasts) settle, so the picture shows
  // the page as a person sees it and not a frame of its loading. Endless animations (spinners)
  // are left alone.
  await page.waitForLoadState('networkidle', { timeout: 5_000 }).catch(() => undefined);
  await page
    .evaluate(() =>
      Promise.race([
        Promise.all([
          document.fonts.ready,
          ...document.getAnimations().filter((a) => a.effect?.getTiming().iterations !== Infinity).map((a) => a.finished.catch(() => undefined)),
        ]),
        new Promise((resolve) => setTimeout(resolve, 2_000)),
      ]).then(() => undefined),
    )
    .catch(() => undefined);
  await page.screenshot({ path, fullPage: true });
  return path;
}

export function portalUrl(path: string): string {
  return `${PUBLIC_URL}${path}`;
}

export function isPortal(url: URL): boolean {
  return url.origin === PORTAL_ORIGIN && !url.pathname.startsWith('/api/');
}

export function isProviderForm(url: URL): boolean {
  return url.origin === PROVIDER_ORIGIN && url.pathname.startsWith('/interaction/');
}

/**
 * Clicks the portal's sign-in button (the page must be on /sign-in) and waits for the provider's
 * form, or for the portal when the provider still has a session. Returns where it ended. The
 * test profile's sign-in limit is far above what the suites use; hitting it is a failure.
 */
export async function startSignIn(page: Page): Promise<'provider-form' | 'portal'> {
  await page.getByTestId('sign-in-button').click();
  const outcome = await Promise.race([
    page.waitForURL((url) => isProviderForm(url), { waitUntil: 'domcontentloaded' }).then(() => 'provider-form' as const),
    page.waitForURL((url) => isPortal(url) && url.pathname !== '/sign-in', { waitUntil: 'domcontentloaded' }).then(() => 'portal' as const),
    page.waitForURL((url) => isPortal(url) && url.searchParams.get('error') === 'rate_limited').then(() => 'rate-limited' as const),
  ]);
  if (outcome === 'rate-limited') throw new Error('the api rate-limited sign-in; raise SIGNIN_RATE_PER_MINUTE of the test profile');
  if (outcome === 'provider-form') await page.locator('#email').waitFor();
  return outcome;
}

/** Fills the identity provider's own form and submits it. */
export async function submitProviderForm(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.locator('#email').fill(email);
  await page.locator('#password').fill(password);
  await page.locator('#submit').click();
}

/**
 * Signs in through the real OIDC code flow: the portal's sign-in page, the provider's form,
 * back to the portal. Starts from `${PUBLIC_URL}/sign-in`, or from the sign-in page the browser
 * is on (a deep link, `fromCurrentPage`). Returns once the signed-in name is shown, or, with
 * `member: false` (someone only the provider knows), once the portal has the browser back.
 */
export async function signIn(
  page: Page,
  email: string,
  options: { password?: string; fromCurrentPage?: boolean; member?: boolean } = {},
): Promise<void> {
  if (!options.fromCurrentPage) await page.goto(portalUrl('/sign-in'));
  await expect.poll(() => new URL(page.url()).pathname).toBe('/sign-in');
  if ((await startSignIn(page)) === 'provider-form') {
    await submitProviderForm(page, email, options.password);
    await page.waitForURL((url) => isPortal(url), { waitUntil: 'domcontentloaded', timeout: 20_000 });
  }
  if (options.member !== false) await page.getByTestId('signed-in-name').waitFor({ state: 'visible' });
}

/**
 * Waits until a PrimeVue DataTable shows the answer to its latest request: rows (or its empty
 * message) and no loading mask. Typing the next filter before that would abort the load.
 */
export async function tableSettled(table: Locator): Promise<void> {
  await table.locator('tbody tr').first().waitFor();
  await table.locator('.p-datatable-mask').waitFor({ state: 'hidden' });
}

/** Polls `check` until it returns a value (not undefined), or fails after `timeoutMs`. */
export async function eventually<T>(what: string, check: () => Promise<T | undefined>, timeoutMs = 15_000, everyMs = 250): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let lastError: unknown;
  while (Date.now() < deadline) {
    try {
      const value = await check();
      if (value !== undefined) return value;
    } catch (error) {
      lastError = error;
    }
    await new Promise((resolve) => setTimeout(resolve, everyMs));
  }
  throw new Error(`${what} did not happen within ${timeoutMs} ms${lastError ? `: ${String(lastError)}` : ''}`);
}

/**
 * Calls the api with the browser's session, as the portal does (CSRF token from the session
 * answer). Used to prepare data that another test already covers through the screens.
 */
export async function callApi<T>(page: Page, method: 'POST' | 'GET', path: string, body?: unknown): Promise<T> {
  return page.evaluate(
    async ({ method, path, body }) => {
      const session = (await fetch('/api/v1/session').then((r) => r.json())) as { csrfToken: string };
      const res = await fetch(`/api/v1${path}`, {
        method,
        headers: { 'content-type': 'application/json', 'x-csrf-token': session.csrfToken },
        body: body === undefined ? undefined : JSON.stringify(body),
      });
      const text = await res.text();
      if (!res.ok) throw new Error(`${method} ${path} answered ${res.status}: ${text}`);
      return (text ? JSON.parse(text) : null) as T;
    },
    { method, path, body },
  );
}
