// Brotli and gzip siblings of every text file of the export, written once at build time: the server
// (server/lib/http/web-app.ts, express-static-gzip) sends the sibling the browser accepts and never compresses
// these per request. WOFF2 and PNG are compressed formats already; tiny files gain less than their headers cost.
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';

const TEXT = /\.(js|css|html|json|webmanifest|svg|txt|ttf|otf|ico|map)$/;
const MIN_BYTES = 512;

export interface PrecompressSummary {
  files: number;
  raw: number;
  br: number;
  gzip: number;
}

function walk(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? walk(path.join(dir, e.name)) : [path.join(dir, e.name)]));
}

export function precompress(dir: string): PrecompressSummary {
  const summary: PrecompressSummary = { files: 0, raw: 0, br: 0, gzip: 0 };
  for (const file of walk(dir)) {
    if (!TEXT.test(file)) continue;
    const raw = fs.readFileSync(file);
    if (raw.length < MIN_BYTES) continue;
    const br = zlib.brotliCompressSync(raw, {
      params: { [zlib.constants.BROTLI_PARAM_QUALITY]: zlib.constants.BROTLI_MAX_QUALITY, [zlib.constants.BROTLI_PARAM_MODE]: zlib.constants.BROTLI_MODE_TEXT, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: raw.length },
    });
    const gzip = zlib.gzipSync(raw, { level: zlib.constants.Z_BEST_COMPRESSION });
    fs.writeFileSync(`${file}.br`, br);
    fs.writeFileSync(`${file}.gz`, gzip);
    summary.files += 1;
    summary.raw += raw.length;
    summary.br += br.length;
    summary.gzip += gzip.length;
  }
  return summary;
}

// `tsx scripts/web/precompress.ts <dir>`: the bench compresses its blank exports with this same step.
if (require.main === module) {
  const dir = process.argv[2];
  if (!dir) throw new Error('usage: precompress.ts <exported web dir>');
  const s = precompress(path.resolve(dir));
  console.log(`[fieldfold] precompressed ${s.files} files: ${s.raw} B raw, ${s.br} B brotli, ${s.gzip} B gzip`);
}
