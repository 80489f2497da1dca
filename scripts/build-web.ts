// Builds the web app into dist/web (scripts/lib.mjs runs it through tsx when a source changed):
// 1. web fonts: the TTFs cut into WOFF2 subsets (scripts/web/fonts.ts), before Metro bundles them;
// 2. `expo export --platform web`: static HTML per route (app.json web.output "static"), split route chunks;
// 3. the web app manifest and its icons (scripts/web/manifest.ts);
// 4. the service worker with its precache (scripts/web/service-worker.ts);
// 5. .br and .gz siblings of every text file (scripts/web/precompress.ts), last, so it covers the files above.
// `--fonts-only` does step 1 (the Expo dev server needs the WOFF2 files too).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { buildWebFonts } from './web/fonts';
import { writeManifest } from './web/manifest';
import { buildServiceWorker } from './web/service-worker';
import { precompress } from './web/precompress';

const root = path.resolve(__dirname, '..');
const outDir = path.join(root, 'dist/web');

async function main() {
  const fonts = await buildWebFonts(root);
  const kb = (n: number) => `${(n / 1024).toFixed(1)} kB`;
  console.log(`[fieldfold] web fonts: ${fonts.map((f) => `${f.file} ${kb(f.bytes)}`).join(', ')}`);
  if (process.argv.includes('--fonts-only')) return;

  const r = spawnSync('npx', ['expo', 'export', '--platform', 'web', '--output-dir', outDir], { cwd: root, stdio: 'inherit', env: { ...process.env, CI: '1' } });
  if (r.status !== 0) throw new Error(`expo export exited with ${r.status ?? r.signal}`);

  const manifest = await writeManifest(root, outDir);
  console.log(`[fieldfold] web app manifest: ${manifest.join(', ')}`);
  const sw = await buildServiceWorker(outDir);
  console.log(`[fieldfold] service worker ${sw.file}: ${sw.precached} files precached (${kb(sw.bytes)})`);
  const c = precompress(outDir);
  console.log(`[fieldfold] precompressed ${c.files} files: ${kb(c.raw)} → ${kb(c.br)} brotli, ${kb(c.gzip)} gzip`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
