import crypto from 'node:crypto';
import { AppError } from '../../lib/errors/app-error';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import type { ServiceContext } from '../../lib/service-context';
import { shortId } from '../../../lib/format';
import { DOCUMENT_KINDS, Document, type DocumentKind } from './document.entity';

// Stored versions of the PDF records. The story of a store: pick the next version number, write the bytes
// to the file store (outside any transaction: it is a side effect), insert the row in one short
// transaction. The partial unique index on (kind, contract or invoice, version) is the promise that two
// stores never share a number, across processes too: the one that loses retries with the next number and
// its file is removed. Rendering and storing never run inside another module's write transaction.

export type { DocumentKind } from './document.entity';
export { Document } from './document.entity';

/** Whose document: a contract's grazing log, or one invoice (of a contract). */
export interface DocumentOwner {
  kind: DocumentKind;
  contractId: string;
  /** Required for 'invoice', absent or null for 'grazing-log'. */
  invoiceId?: string | null;
}

export interface StoreDocumentInput extends DocumentOwner {
  bytes: Buffer;
  /** Default 'application/pdf'. */
  contentType?: string;
}

export interface StoreRenderedDocumentInput extends DocumentOwner {
  /** Makes the file for the version it will be stored as (the PDFs print their version). */
  render: (version: number) => Promise<Buffer>;
  contentType?: string;
}

const PDF = 'application/pdf';
/** Retries on a lost race for a version number; each round trip is a few ms, so this is far beyond need. */
const MAX_ATTEMPTS = 6;

function checkOwner(o: DocumentOwner): void {
  if (!DOCUMENT_KINDS.includes(o.kind)) throw new Error(`Unknown document kind: ${String(o.kind)}`);
  if (typeof o.contractId !== 'string' || o.contractId === '') throw new Error('A document belongs to a contract');
  if (o.kind === 'invoice' && !o.invoiceId) throw new Error('An invoice document needs its invoiceId');
  if (o.kind === 'grazing-log' && o.invoiceId) throw new Error('A grazing-log document has no invoiceId');
}

function checkBytes(bytes: Buffer, contentType: string): void {
  if (!Buffer.isBuffer(bytes) || bytes.length === 0) throw new Error('A document needs its bytes');
  // A PDF begins with "%PDF-": a cheap guard against storing the wrong thing under a PDF's name.
  if (contentType === PDF && bytes.subarray(0, 5).toString('latin1') !== '%PDF-') throw new Error('These bytes are not a PDF');
}

function ownerWhere(o: DocumentOwner) {
  return o.kind === 'invoice' ? { kind: o.kind, invoiceId: o.invoiceId as string } : { kind: o.kind, contractId: o.contractId };
}

async function nextVersion(ctx: ServiceContext, o: DocumentOwner): Promise<number> {
  const qb = ctx.ds.manager.createQueryBuilder(Document, 'd').select('MAX(d.version)', 'v').where('d.kind = :kind', { kind: o.kind });
  if (o.kind === 'invoice') qb.andWhere('d.invoiceId = :invoiceId', { invoiceId: o.invoiceId });
  else qb.andWhere('d.contractId = :contractId', { contractId: o.contractId });
  const row = await qb.getRawOne<{ v: number | string | null }>();
  return Number(row?.v ?? 0) + 1;
}

interface StoredFile {
  id: string;
  storageKey: string;
  sha256: string;
  sizeBytes: number;
  contentType: string;
}

async function putFile(ctx: ServiceContext, kind: DocumentKind, bytes: Buffer, contentType: string): Promise<StoredFile> {
  checkBytes(bytes, contentType);
  const id = crypto.randomUUID();
  // The key is the row's own random id, so a store that loses the race never touches the winner's file.
  const storageKey = `${kind}/${id}${contentType === PDF ? '.pdf' : '.bin'}`;
  await ctx.documents.put(storageKey, bytes);
  return { id, storageKey, sha256: crypto.createHash('sha256').update(bytes).digest('hex'), sizeBytes: bytes.length, contentType };
}

/** Inserts the row for `version`; null when another store took that version first. */
async function insertVersion(ctx: ServiceContext, o: DocumentOwner, version: number, file: StoredFile): Promise<Document | null> {
  try {
    return await inTransaction(ctx.ds, async (tx) => {
      await tx.insert(Document, {
        id: file.id,
        kind: o.kind,
        contractId: o.contractId,
        invoiceId: o.kind === 'invoice' ? (o.invoiceId as string) : null,
        version,
        sha256: file.sha256,
        sizeBytes: file.sizeBytes,
        contentType: file.contentType,
        storageKey: file.storageKey,
      });
      return tx.findOneByOrFail(Document, { id: file.id });
    });
  } catch (err) {
    if (isUniqueViolation(err)) return null;
    throw err;
  }
}

function busy(): AppError {
  return AppError.conflict('The document was being saved by another request at the same moment; try again', 'document_busy');
}

/**
 * Stores `bytes` as the next version of the owner's document and returns its record. Use it for files that
 * do not print their own version; for the PDFs (which do) use storeRenderedDocument.
 */
export async function storeDocument(ctx: ServiceContext, input: StoreDocumentInput): Promise<Document> {
  checkOwner(input);
  const file = await putFile(ctx, input.kind, input.bytes, input.contentType ?? PDF);
  try {
    for (let attempt = 0; attempt < MAX_ATTEMPTS; attempt++) {
      const doc = await insertVersion(ctx, input, await nextVersion(ctx, input), file);
      if (doc) return doc;
    }
    throw busy();
  } catch (err) {
    await ctx.documents.delete(file.storageKey);
    throw err;
  }
}

/**
 * Renders and stores the next version of the owner's document: `render(version)` is called with the number
 * the file will be stored as, and again with the following number if another store took that one first.
 * Call it after the caller's own transaction has committed (rendering is a side effect).
 */
export async function storeRenderedDocument(ctx: ServiceContext, input: StoreRenderedDocumentInput): Promise<Document> {
  checkOwner(input);
  for (let attempt = 0; attempt < MAX_ATTEMPTS; attempt++) {
    const version = await nextVersion(ctx, input);
    const file = await putFile(ctx, input.kind, await input.render(version), input.contentType ?? PDF);
    let doc: Document | null;
    try {
      doc = await insertVersion(ctx, input, version, file);
    } catch (err) {
      await ctx.documents.delete(file.storageKey);
      throw err;
    }
    if (doc) return doc;
    await ctx.documents.delete(file.storageKey);
  }
  throw busy();
}

/** The newest stored version of the owner's document, or null when none is stored yet. */
export async function latestDocument(ctx: ServiceContext, owner: DocumentOwner): Promise<Document | null> {
  checkOwner(owner);
  return ctx.ds.manager.findOne(Document, { where: ownerWhere(owner), order: { version: 'DESC' } });
}

/** Every stored version of the owner's document, oldest first. */
export async function listDocuments(ctx: ServiceContext, owner: DocumentOwner): Promise<Document[]> {
  checkOwner(owner);
  return ctx.ds.manager.find(Document, { where: ownerWhere(owner), order: { version: 'ASC' } });
}

/** The stored bytes of a document, or null if its file has gone missing from the store. */
export async function readDocument(ctx: ServiceContext, doc: Document): Promise<Buffer | null> {
  return ctx.documents.get(doc.storageKey);
}

/** "fieldfold-grazing-log-7c1e2f4a-v2.pdf", "fieldfold-invoice-b2c3d4e5-v1.pdf". */
export function documentFileName(doc: Pick<Document, 'kind' | 'contractId' | 'invoiceId' | 'version' | 'contentType'>): string {
  const owner = doc.kind === 'invoice' ? shortId(doc.invoiceId ?? '') : shortId(doc.contractId);
  return `fieldfold-${doc.kind}-${owner}-v${doc.version}${doc.contentType === PDF ? '.pdf' : '.bin'}`;
}
