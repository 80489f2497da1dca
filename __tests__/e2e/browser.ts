import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';

export const BASE_URL = process.env.E2E_BASE_URL ?? 'http://127.0.0.1:8080';
export const SHOTS = path.resolve(__dirname, '../../artifacts/screenshots');
export const PHONE = { width: 390, height: 844 };
export const WIDE = { width: 1280, height: 800 };

export interface Browser {
  context: BrowserContext;
  page: Page;
  /** Every URL the page asked for that was not on the Fieldfold server (should stay empty: fonts ship with the app). */
  offsite: string[];
  /** What the content-security policy refused on any page (close() fails the test when it is not empty). */
  cspViolations: string[];
  close: () => Promise<void>;
}

/** Debian's chromium, headless, with a fresh profile and background networking off (the machine has no internet). */
export async function openBrowser(viewport: { width: number; height: number }): Promise<Browser> {
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const offsite: string[] = [];
  page.on('request', (req) => {
    const url = req.url();
    if (!url.startsWith(BASE_URL) && !url.startsWith('data:') && !url.startsWith('blob:')) offsite.push(url);
  });
  const cspViolations: string[] = [];
  context.on('console', (msg) => {
    if (/Content Security Policy/i.test(msg.text())) cspViolations.push(msg.text());
  });
  return {
    context,
    page,
    offsite,
    cspViolations,
    close: async () => {
      await context.close();
      fs.rmSync(profile, { recursive: true, force: true });
      if (cspViolations.length > 0) throw new Error(`The content-security policy refused: ${cspViolations.join(' | ')}`);
    },
  };
}

export async function screenshot(page: Page, name: string) {
  fs.mkdirSync(SHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SHOTS, `${name}.png`), fullPage: true });
}

/**
 * Waits until `expression` (JavaScript text: the suite compiles without the DOM's types) is truthy in the page.
 * Not page.waitForFunction: with a string it evaluates the text from inside the page, which the app's
 * content-security policy refuses as eval (no 'unsafe-eval'); page.evaluate goes through the debugger protocol.
 */
export async function waitForExpression(page: Page, expression: string, timeoutMs = 30_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    // A navigation in between destroys the context the expression ran in: try again in the next one.
    if (await page.evaluate(expression).catch(() => false)) return;
    if (Date.now() > until) throw new Error(`timed out after ${timeoutMs} ms waiting for: ${expression}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A labelled input on the visible screen (a stack navigator can keep a hidden copy of the previous screen). */
export function field(page: Page, label: string) {
  return page.getByLabel(label, { exact: true }).filter({ visible: true });
}

export function button(page: Page, name: string) {
  return page.getByRole('button', { name, exact: true }).filter({ visible: true });
}

export async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${BASE_URL}/sign-in`);
  await field(page, 'Email').fill(email);
  await field(page, 'Password').fill(password);
  await button(page, 'Sign in').click();
}

/** The names of the navigation tabs the signed-in role sees. */
export async function tabNames(page: Page): Promise<string[]> {
  const tabs = page.locator('[role="tablist"]:visible [role="tab"]');
  await tabs.first().waitFor();
  return tabs.evaluateAll((els) => els.map((e) => e.getAttribute('aria-label') ?? ''));
}

/** Calls the API directly (set-up and cross-checks); throws with the body on any 4xx/5xx. */
export async function api<T>(path: string, init: { method?: string; body?: unknown; token?: string } = {}): Promise<T> {
  const send = () =>
    fetch(`${BASE_URL}/api${path}`, {
      method: init.method ?? (init.body ? 'POST' : 'GET'),
      headers: { 'Content-Type': 'application/json', ...(init.token ? { Authorization: `Bearer ${init.token}` } : {}) },
      body: init.body ? JSON.stringify(init.body) : undefined,
    });
  // Node's fetch keeps connections open between calls; one idle for the server's 5 s keep-alive may be closed by the
  // server just as a call goes out on it ("other side closed", before the server read a byte): send it once more.
  const res = await send().catch((err: { cause?: { code?: string } }) => {
    if (err?.cause?.code === 'UND_ERR_SOCKET') return send();
    throw err;
  });
  const json = (await res.json().catch(() => ({}))) as T;
  if (!res.ok) throw new Error(`${path}: ${res.status} ${JSON.stringify(json)}`);
  return json;
}
