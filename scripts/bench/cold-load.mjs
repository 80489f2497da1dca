// One cold page load in a fresh headless-chromium profile, optionally on a throttled network and CPU (CDP), timed
// the same way for every app the bench compares.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

// The phone profile of issue 7: a slow 4G link and a mid-range phone's CPU.
export const PHONE = { name: 'phone', label: 'phone (1.6 Mbit/s, 150 ms, CPU 4×)', viewport: { width: 390, height: 844 }, network: { latency: 150, downloadThroughput: 1_600_000 / 8, uploadThroughput: 750_000 / 8 }, cpu: 4 };
export const UNTHROTTLED = { name: 'unthrottled', label: 'unthrottled', viewport: { width: 1280, height: 800 }, network: null, cpu: 1 };

/** A fresh profile (nothing cached, no service worker) on `profile`'s network and CPU; `fn(page, bytes)` loads. */
async function coldPage(chromium, profile, fn) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-bench-chromium-'));
  const ctx = await chromium.launchPersistentContext(dir, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport: profile.viewport,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  try {
    const page = ctx.pages()[0] ?? (await ctx.newPage());
    const cdp = await ctx.newCDPSession(page);
    await cdp.send('Network.enable');
    if (profile.network) await cdp.send('Network.emulateNetworkConditions', { offline: false, ...profile.network });
    if (profile.cpu > 1) await cdp.send('Emulation.setCPUThrottlingRate', { rate: profile.cpu });
    const bytes = { received: 0 };
    cdp.on('Network.loadingFinished', (e) => (bytes.received += e.encodedDataLength));
    return await fn(page, bytes);
  } finally {
    await ctx.close();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Loads `url` cold and answers first contentful paint, the moment the page's first input is usable, and the bytes
 * received until then. "Usable" = React has attached its handlers to the input (rendered on the client, or hydrated
 * from static HTML), so typing and pressing work; it is polled, so it lands when the main thread is free, as a
 * thumb would find it.
 */
export async function coldLoad(chromium, url, profile) {
  return coldPage(chromium, profile, async (page, bytes) => {
    await page.addInitScript(() => {
      const check = () => {
        const input = document.querySelector('input');
        if (input && Object.keys(input).some((k) => k.startsWith('__reactProps'))) window.__benchUsableAt = performance.now();
        else setTimeout(check, 16);
      };
      check();
    });
    await page.goto(url, { waitUntil: 'commit' });
    await page.waitForFunction(() => window.__benchUsableAt !== undefined, null, { timeout: 120_000, polling: 50 });
    const bytesUntilUsable = bytes.received;
    const t = await page.evaluate(
      () =>
        new Promise((resolve) => {
          // The paint entry can be recorded a frame after the form became usable: wait for it.
          new PerformanceObserver((list, observer) => {
            const fcp = list.getEntriesByName('first-contentful-paint')[0];
            if (!fcp) return;
            observer.disconnect();
            resolve({ fcp: fcp.startTime, usable: window.__benchUsableAt });
          }).observe({ type: 'paint', buffered: true });
        }),
    );
    return { ...t, bytes: bytesUntilUsable };
  });
}

/**
 * A signed-in screen loaded cold: `storage` (what the app keeps in localStorage: the token, the account) is in
 * place before the first script runs, as after an earlier sign-in; nothing else is cached. Answers the time from
 * navigation start until `selector` is in the page (polled each frame) and the bytes received until then.
 */
export async function coldContent(chromium, url, profile, { storage, selector }) {
  return coldPage(chromium, profile, async (page, bytes) => {
    await page.addInitScript(
      ({ storage, selector }) => {
        for (const [k, v] of Object.entries(storage)) localStorage.setItem(k, v);
        const check = () => {
          if (document.querySelector(selector)) window.__benchContentAt = performance.now();
          else requestAnimationFrame(check);
        };
        check();
      },
      { storage, selector },
    );
    await page.goto(url, { waitUntil: 'commit' });
    await page.waitForFunction(() => window.__benchContentAt !== undefined, null, { timeout: 120_000, polling: 50 });
    return { content: await page.evaluate(() => window.__benchContentAt), bytes: bytes.received };
  });
}
