import type { BrowserContext, Response } from 'playwright-core';
import { api, BASE_URL, PHONE, WIDE, button, field, openBrowser, screenshot, waitForExpression, type Browser } from './browser';

// Issue 7 (fast on a phone) and the offline shell of issue 8, in the browser: deep links on a cold load and a
// reload, compressed scripts, fonts from this machine, and a page that still renders with the network gone.
const PASSWORD = 'calder-valley-demo';
const TOKEN_KEY = 'fieldfold.token'; // hooks/auth/token-storage.web.ts
/** True once React has attached its handlers to the page's first input (hydrated). A string: no DOM types here. */
const HYDRATED = "(() => { const i = document.querySelector('input'); return !!i && Object.keys(i).some((k) => k.startsWith('__reactProps')); })()";

interface BlockList {
  items: Array<{ id: string; name: string }>;
}

/** Signs in through the API and leaves the token where the web app keeps it, so the first page load is already signed in. */
async function signedIn(context: BrowserContext, email: string): Promise<string> {
  const { token } = await api<{ token: string }>('/auth/login', { body: { email, password: PASSWORD } });
  // A string: the suite compiles without the DOM's types.
  await context.addInitScript(`if (!localStorage.getItem(${JSON.stringify(TOKEN_KEY)})) localStorage.setItem(${JSON.stringify(TOKEN_KEY)}, ${JSON.stringify(token)});`);
  return token;
}

async function firstBlock(token: string) {
  const { items } = await api<BlockList>('/blocks', { token });
  expect(items.length).toBeGreaterThan(0);
  return items[0];
}

/** Resolves once the service worker controls the page, i.e. it has installed and precached the app shell. */
async function serviceWorkerInControl(b: Browser) {
  await waitForExpression(b.page, "navigator.serviceWorker?.controller?.state === 'activated'", 60_000);
}

describe('Phone speed and the offline shell', () => {
  let b: Browser;
  afterEach(async () => {
    expect(b.offsite).toEqual([]); // nothing from outside the machine: no font CDN, no script CDN
    await b.close();
  });

  test.each([
    [390, PHONE],
    [1280, WIDE],
  ] as const)('At %i px a deep link to a block opens on a cold load and again on a reload', async (width, viewport) => {
    b = await openBrowser(viewport);
    const token = await signedIn(b.context, 'greta@calder.example');
    const block = await firstBlock(token);
    const url = `${BASE_URL}/blocks/${block.id}`;

    const cold = await b.page.goto(url);
    expect(cold?.status()).toBe(200);
    await b.page.getByRole('heading', { name: block.name }).waitFor();
    expect(b.page.url()).toBe(url);
    await screenshot(b.page, `deep-link-block-${width}`);

    const again = await b.page.reload();
    expect(again?.status()).toBe(200);
    await b.page.getByRole('heading', { name: block.name }).waitFor();
    expect(b.page.url()).toBe(url);
  });

  test("The page's HTML shows the signed-in frame before any script runs, and the scripts arrive compressed and cached for good", async () => {
    b = await openBrowser(PHONE);
    const scripts: Response[] = [];
    const fonts: string[] = [];
    b.page.on('response', (r) => {
      if (r.request().resourceType() === 'script') scripts.push(r);
      if (r.request().resourceType() === 'font') fonts.push(r.url());
    });
    // The frame is in the static HTML: rendered at build time for /blocks/[blockId], served for any id.
    const html = await (await fetch(`${BASE_URL}/blocks/any-block-id`)).text();
    expect(html).toContain('Opening your Fieldfold…');
    expect(html).toContain('aria-label="Fieldfold"');

    await b.page.goto(`${BASE_URL}/sign-in`);
    await field(b.page, 'Email').fill('greta@calder.example');
    expect(scripts.length).toBeGreaterThan(1);
    let compressed = 0;
    for (const r of scripts) {
      const headers = await r.allHeaders();
      // Files under 512 B are sent as they are (scripts/web/precompress.ts): their headers would outweigh the saving.
      if ((await r.body()).length >= 512) {
        expect({ url: r.url(), encoding: headers['content-encoding'] }).toEqual({ url: r.url(), encoding: expect.stringMatching(/^(br|gzip)$/) });
        compressed += 1;
      }
      if (r.url().includes('/_expo/static/')) expect(headers['cache-control']).toBe('public, max-age=31536000, immutable');
    }
    expect(compressed).toBeGreaterThan(1); // the entry bundle and the shared chunk at least
    // Route chunks: the sign-in page loads neither the bid comparison nor the calculator.
    const names = scripts.map((r) => new URL(r.url()).pathname.split('/').pop()!);
    expect(names.some((n) => n.startsWith('sign-in-'))).toBe(true);
    expect(names.filter((n) => /^(calculator|bid|index)-/.test(n))).toEqual([]);
    // The faces wait in the HTML (media="not all") and swap in once the app runs: WOFF2 subsets from this server.
    expect(html).toContain('<style id="fieldfold-fonts" media="not all">');
    await b.page.waitForFunction("Array.from(document.fonts).some((f) => f.family.startsWith('PublicSans') && f.status === 'loaded')");
    expect(fonts.length).toBeGreaterThan(0);
    for (const f of fonts) expect(f).toMatch(new RegExp(`^${BASE_URL}/assets/.+\\.woff2$`));
  });

  test('Text typed into the sign-in form before its scripts arrive is kept when the page comes alive, and signs in', async () => {
    b = await openBrowser(PHONE);
    // Hold every script back: on a slow phone the statically rendered form is on screen well before them.
    let release!: () => void;
    const scriptsHeld = new Promise<void>((resolve) => (release = resolve));
    await b.page.route('**/_expo/static/js/**', async (route) => {
      await scriptsHeld;
      await route.continue();
    });
    await b.page.goto(`${BASE_URL}/sign-in`, { waitUntil: 'commit' });
    await field(b.page, 'Email').pressSequentially('wade@calder.example');
    await field(b.page, 'Password').pressSequentially(PASSWORD);
    expect(await b.page.evaluate(HYDRATED)).toBe(false);
    release();
    await waitForExpression(b.page, HYDRATED);
    expect(await field(b.page, 'Email').inputValue()).toBe('wade@calder.example');
    await button(b.page, 'Sign in').click();
    await b.page.getByRole('heading', { name: 'Find grazing' }).waitFor();
  });

  test('After one visit, a reload with the network gone still renders the page: a block deep link shows its frame, the calculator computes', async () => {
    b = await openBrowser(PHONE);
    const token = await signedIn(b.context, 'greta@calder.example');
    const block = await firstBlock(token);
    await b.page.goto(`${BASE_URL}/blocks/${block.id}`);
    await b.page.getByRole('heading', { name: block.name }).waitFor();
    await serviceWorkerInControl(b);

    const failedOffline: string[] = [];
    b.context.on('requestfailed', (r) => failedOffline.push(new URL(r.url()).pathname));
    await b.context.setOffline(true);
    const offline = await b.page.reload();
    expect(offline?.fromServiceWorker()).toBe(true);
    // The worker tried the network first, which failed; the answer is the precached HTML of /blocks/[blockId].
    expect(failedOffline).toContain(`/blocks/${block.id}`);
    // The account kept on the device restores the session with no network, so the signed-in frame shows at once.
    await b.page.getByLabel('Fieldfold', { exact: true }).first().waitFor();
    expect(await b.page.evaluate("fetch('/api/health').then(() => 'answered', () => 'no network')")).toBe('no network');
    await screenshot(b.page, 'offline-block-frame-390');

    // A public screen never opened in this tab: its HTML and its route chunk were precached with the rest.
    await b.page.goto(`${BASE_URL}/calculator`);
    await b.page.getByRole('heading', { name: 'Forage calculator' }).waitFor();
    await b.page.getByText(/head-days · \d+ days for \d+ head/).first().waitFor();
    await screenshot(b.page, 'offline-calculator-390');
    await b.context.setOffline(false);
  });
});
