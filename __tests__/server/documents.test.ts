import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import express from 'express';
import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { rawQuery } from '../helpers/test-database';
import { market } from '../helpers/market';
import { grazingLogData } from '../helpers/pdf-scenario';
import type { ServiceContext } from '../../server/lib/service-context';
import { localFileStore } from '../../server/lib/storage/file-store';
import { errorHandler } from '../../server/lib/errors/error-handler';
import { isUniqueViolation } from '../../server/lib/db/unique-violation';
import { latestDocument, listDocuments, readDocument, storeDocument, storeRenderedDocument, type Document } from '../../server/modules/documents/documents.service';
import { sendDocument } from '../../server/modules/documents/documents.download';

// The documents store: versions per contract's grazing log and per invoice, the bytes in DATA_DIR/documents
// (a temp folder here), and the download helper the contracts and invoices routes call after their policy.

type TestApp = Awaited<ReturnType<typeof makeTestApp>>;

const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');
/** A small stand-in PDF: the store checks the "%PDF-" header, not the rest. */
const fakePdf = (text: string) => Buffer.from(`%PDF-1.7\n% ${text}\n%%EOF\n`, 'latin1');

let t: TestApp;
let ctx: ServiceContext;
let contractId: string;
let otherContractId: string;
const logs: string[] = [];

async function awardedContract(): Promise<string> {
  const m = market(t);
  const grower = await m.grower('Greta Olsen');
  const grazier = await m.grazier('Wade Kellner');
  const block = await m.openBlock(grower);
  const bid = await m.bid(grazier, block.id);
  const res = await m.api().post(`/api/bids/${bid.id}/award`).set(grower.auth);
  if (res.status !== 201) throw new Error(`award failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.contract.id as string;
}

beforeAll(async () => {
  t = await makeTestApp();
  ctx = { ...t.ctx, log: (msg) => logs.push(msg) };
  contractId = await awardedContract();
  otherContractId = await awardedContract();
});
afterAll(() => t.close());

function filesUnder(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((e) => e.isFile()).map((e) => path.join(e.parentPath, e.name));
}

describe('storeDocument', () => {
  it('When a contract stores its grazing log three times, then the versions are 1, 2, 3 and the bytes round-trip with their SHA-256', async () => {
    const stored: Document[] = [];
    for (const v of ['first', 'second', 'third']) stored.push(await storeDocument(ctx, { kind: 'grazing-log', contractId, bytes: fakePdf(v) }));
    expect(stored.map((d) => d.version)).toEqual([1, 2, 3]);
    for (const [i, d] of stored.entries()) {
      const bytes = fakePdf(['first', 'second', 'third'][i]);
      expect(d).toMatchObject({ kind: 'grazing-log', contractId, invoiceId: null, contentType: 'application/pdf', sizeBytes: bytes.length, sha256: sha256(bytes) });
      expect(d.storageKey).toMatch(/^grazing-log\/[0-9a-f-]{36}\.pdf$/);
      const back = await readDocument(ctx, d);
      expect(back?.equals(bytes)).toBe(true);
      expect(sha256(back!)).toBe(d.sha256);
      expect(fs.existsSync(path.join(t.documentsDir, d.storageKey))).toBe(true);
    }
    expect((await latestDocument(ctx, { kind: 'grazing-log', contractId }))?.version).toBe(3);
    expect((await listDocuments(ctx, { kind: 'grazing-log', contractId })).map((d) => d.version)).toEqual([1, 2, 3]);
    // Nothing half-written is left behind.
    expect(filesUnder(t.documentsDir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('When another contract and an invoice store documents, then each counts its own versions from 1', async () => {
    const other = await storeDocument(ctx, { kind: 'grazing-log', contractId: otherContractId, bytes: fakePdf('other') });
    const inv1 = await storeDocument(ctx, { kind: 'invoice', contractId, invoiceId: 'inv-aaaa-1', bytes: fakePdf('invoice a') });
    const inv2 = await storeDocument(ctx, { kind: 'invoice', contractId, invoiceId: 'inv-aaaa-1', bytes: fakePdf('invoice a, paid') });
    const invB = await storeDocument(ctx, { kind: 'invoice', contractId, invoiceId: 'inv-bbbb-2', bytes: fakePdf('invoice b') });
    expect([other.version, inv1.version, inv2.version, invB.version]).toEqual([1, 1, 2, 1]);
    expect(inv1.storageKey).toMatch(/^invoice\//);
    expect((await latestDocument(ctx, { kind: 'invoice', contractId, invoiceId: 'inv-aaaa-1' }))?.id).toBe(inv2.id);
    expect(await latestDocument(ctx, { kind: 'invoice', contractId, invoiceId: 'inv-none' })).toBeNull();
  });

  it('When two stores for one contract run at once, then they get versions 1 and 2', async () => {
    const fresh = await awardedContract();
    const [a, b] = await Promise.all([
      storeDocument(ctx, { kind: 'grazing-log', contractId: fresh, bytes: fakePdf('a') }),
      storeDocument(ctx, { kind: 'grazing-log', contractId: fresh, bytes: fakePdf('b') }),
    ]);
    expect([a.version, b.version].sort()).toEqual([1, 2]);
    expect((await readDocument(ctx, a))?.equals(fakePdf('a'))).toBe(true);
    expect((await readDocument(ctx, b))?.equals(fakePdf('b'))).toBe(true);
  });

  it('When the database already holds a version, then a second row with that number is refused by the unique index', async () => {
    const d = await latestDocument(ctx, { kind: 'grazing-log', contractId });
    const err = await rawQuery(
      t.dataSource,
      `INSERT INTO "documents" ("id", "kind", "contract_id", "version", "sha256", "size_bytes", "content_type", "storage_key") VALUES (:id, 'grazing-log', :contractId, :version, 'x', 1, 'application/pdf', :key)`,
      { id: crypto.randomUUID(), contractId, version: d!.version, key: `grazing-log/${crypto.randomUUID()}.pdf` },
    )
      .catch((e: unknown) => e);
    expect(isUniqueViolation(err)).toBe(true);
  });

  it('When the owner or the bytes are wrong, then nothing is stored', async () => {
    const before = filesUnder(t.documentsDir).length;
    await expect(storeDocument(ctx, { kind: 'invoice', contractId, bytes: fakePdf('x') })).rejects.toThrow(/invoiceId/);
    await expect(storeDocument(ctx, { kind: 'grazing-log', contractId, invoiceId: 'inv-1', bytes: fakePdf('x') })).rejects.toThrow(/no invoiceId/);
    await expect(storeDocument(ctx, { kind: 'grazing-log', contractId, bytes: Buffer.from('<html>') })).rejects.toThrow(/not a PDF/);
    // A contract that does not exist fails on the foreign key after the file was written: the file goes too.
    await expect(storeDocument(ctx, { kind: 'grazing-log', contractId: crypto.randomUUID(), bytes: fakePdf('orphan') })).rejects.toThrow();
    expect(filesUnder(t.documentsDir).length).toBe(before);
  });
});

describe('storeRenderedDocument', () => {
  it('When two renders race for the same version, then the loser renders again with the next number and its first file is removed', async () => {
    const fresh = await awardedContract();
    const calls: number[] = [];
    // Both renders wait until both have started, so both were handed version 1 before either is stored.
    let release!: () => void;
    const bothStarted = new Promise<void>((r) => (release = r));
    const render = async (version: number) => {
      calls.push(version);
      if (calls.length === 2) release();
      if (calls.length <= 2) await bothStarted;
      return fakePdf(`rendered as version ${version}`);
    };
    const [a, b] = await Promise.all([
      storeRenderedDocument(ctx, { kind: 'grazing-log', contractId: fresh, render }),
      storeRenderedDocument(ctx, { kind: 'grazing-log', contractId: fresh, render }),
    ]);
    expect(calls).toEqual([1, 1, 2]);
    expect([a.version, b.version].sort()).toEqual([1, 2]);
    for (const d of [a, b]) expect((await readDocument(ctx, d))?.toString('latin1')).toContain(`rendered as version ${d.version}`);
    const keys = (await listDocuments(ctx, { kind: 'grazing-log', contractId: fresh })).map((d) => path.join(t.documentsDir, d.storageKey));
    const onDisk = filesUnder(path.join(t.documentsDir, 'grazing-log'));
    expect(onDisk.filter((f) => fs.readFileSync(f, 'latin1').includes('rendered as version'))).toEqual(expect.arrayContaining(keys));
    expect(onDisk.filter((f) => fs.readFileSync(f, 'latin1').includes('rendered as version')).length).toBe(2);
  });

  it('When the real grazing log is rendered and stored, then the stored SHA-256 is that of rendering the same version again', async () => {
    const fresh = await awardedContract();
    const doc = await storeRenderedDocument(ctx, {
      kind: 'grazing-log',
      contractId: fresh,
      render: (version) => ctx.pdf.renderGrazingLog(grazingLogData({ contractId: fresh, version })),
    });
    expect(doc.version).toBe(1);
    const again = await ctx.pdf.renderGrazingLog(grazingLogData({ contractId: fresh, version: 1 }));
    expect(sha256(again)).toBe(doc.sha256);
    expect(doc.sizeBytes).toBe(again.length);
  });
});

describe('sendDocument', () => {
  function downloadApp(doc: () => Document) {
    const app = express();
    app.get('/download', async (req, res) => sendDocument(ctx, req, res, doc()));
    app.use(errorHandler(() => {}));
    return app;
  }

  it('When a stored log is downloaded, then it comes as an attachment named by contract and version, never cached, with its SHA-256 as ETag', async () => {
    const doc = (await latestDocument(ctx, { kind: 'grazing-log', contractId }))!;
    const bytes = (await readDocument(ctx, doc))!;
    const res = await request(downloadApp(() => doc))
      .get('/download')
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const short = contractId.replace(/-/g, '').slice(0, 8);
    expect(res.headers['content-disposition']).toBe(`attachment; filename="fieldfold-grazing-log-${short}-v${doc.version}.pdf"`);
    expect(res.headers['cache-control']).toBe('private, no-store');
    expect(res.headers.etag).toBe(`"${doc.sha256}"`);
    expect(res.headers['content-length']).toBe(String(bytes.length));
    expect((res.body as Buffer).equals(bytes)).toBe(true);
  });

  it('When the client already holds that version, then the answer is 304 without a body', async () => {
    const doc = (await latestDocument(ctx, { kind: 'grazing-log', contractId }))!;
    const res = await request(downloadApp(() => doc)).get('/download').set('If-None-Match', `"${doc.sha256}"`);
    expect(res.status).toBe(304);
  });

  it('When an invoice is downloaded, then its file name carries the invoice and version', async () => {
    const doc = (await latestDocument(ctx, { kind: 'invoice', contractId, invoiceId: 'inv-aaaa-1' }))!;
    const res = await request(downloadApp(() => doc)).get('/download');
    expect(res.headers['content-disposition']).toBe('attachment; filename="fieldfold-invoice-invaaaa1-v2.pdf"');
  });

  it('When the file has gone missing from the store, then the answer is a 404 in the API error shape and the log says which', async () => {
    const doc = await storeDocument(ctx, { kind: 'grazing-log', contractId: otherContractId, bytes: fakePdf('to lose') });
    await ctx.documents.delete(doc.storageKey);
    const res = await request(downloadApp(() => doc)).get('/download');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: 'Document file not found' } });
    expect(logs.some((l) => l.includes(doc.id))).toBe(true);
  });
});

describe('localFileStore', () => {
  it('When keys try to leave the folder or are not the server\'s own, then the store refuses them', async () => {
    const store = localFileStore(t.documentsDir);
    for (const key of ['../escape.pdf', 'grazing-log/../../escape.pdf', '/etc/passwd', 'Grazing-Log/A.pdf', 'grazing-log/', 'no-extension', 'a//b.pdf']) {
      await expect(store.put(key, fakePdf('x'))).rejects.toThrow(/Not a stored file name/);
      await expect(store.get(key)).rejects.toThrow(/Not a stored file name/);
    }
  });

  it('When a key is written twice, read, opened and deleted, then the last bytes win, a missing key is null and deleting twice is fine', async () => {
    const store = localFileStore(t.documentsDir);
    await store.put('scratch/one.pdf', fakePdf('old'));
    await store.put('scratch/one.pdf', fakePdf('new'));
    expect((await store.get('scratch/one.pdf'))?.equals(fakePdf('new'))).toBe(true);
    const opened = await store.open('scratch/one.pdf');
    expect(opened?.sizeBytes).toBe(fakePdf('new').length);
    const chunks: Buffer[] = [];
    for await (const c of opened!.stream) chunks.push(c as Buffer);
    expect(Buffer.concat(chunks).equals(fakePdf('new'))).toBe(true);
    await store.delete('scratch/one.pdf');
    await store.delete('scratch/one.pdf');
    expect(await store.get('scratch/one.pdf')).toBeNull();
    expect(await store.open('scratch/one.pdf')).toBeNull();
    expect(fs.readdirSync(path.join(t.documentsDir, 'scratch'))).toEqual([]);
  });
});
