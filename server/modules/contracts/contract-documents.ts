import { inOpenTransaction } from '../../lib/db/transaction';
import { AppError } from '../../lib/errors/app-error';
import type { ServiceContext } from '../../lib/service-context';
import { Account } from '../accounts/account.entity';
import { Contract } from './contract.entity';
import { ContractSignature } from './contract-records.entity';
import { figuresOf, termsInForce } from './contract-state';
import { contractViews } from './contract-views';
import { assertCanRead } from './contracts.policy';
import { allEntryViews } from './contract-log.service';
import { GENERAL_GRAZING_CAUTIONS } from '../../../lib/grazing/general-cautions';
import { bindingSprayRecord } from '../../../lib/grazing/safety';
import { formatDay } from '../../../lib/format';
import type { ContractView, LogEntryView, LogFigures, SignOffView } from '../../../lib/schemas/contract';

// The grazing log as a PDF for both parties' files. Rendering is a side effect: it never runs inside a
// write transaction, and as far as it can it stays off the request path of a read. When the head-days are
// agreed, or an amendment both signed takes effect, the use case renders the record after its commit and
// stores it as the next version (refreshLogDocument); GET …/log.pdf then serves the stored file. It renders
// on demand only when no stored file matches the contract as it stands — before the head-days are agreed
// (a draft of a log still being kept, never stored, since it changes with every entry), or when the render
// after a commit failed (the commit stood; the file is made on the first request instead).
//
// The renderer (server/lib/pdf, renderGrazingLog) and the document store (server/modules/documents) are
// ports on the service context. Until they are wired, the route answers 503 and nothing else changes.

export interface GrazingLogSignature {
  /** The party who signed (named `role` as server/lib/pdf's PdfSignature names it). */
  role: 'grower' | 'grazier';
  typedName: string;
  signedAt: string;
  termsVersion: number;
  termsHash: string;
  cautionsAcknowledged: boolean;
  ip: string | null;
  userAgent: string | null;
}

/** Everything the grazing-log PDF prints, as plain data (figures already computed by lib/). */
export interface GrazingLogDocumentData {
  contractId: string;
  /** Version of the stored document (the store numbers them); 0 for a draft that is not stored. */
  version: number;
  /** ISO instant the file is made; also its creation date, so the same data renders the same bytes. */
  generatedAt: string;
  /** True until the head-days are agreed: the file says it is a draft of a log still being kept. */
  draft: boolean;
  status: ContractView['status'];
  /** The block's IANA zone: every time on the record is printed in it. */
  timeZone: string;
  grower: { name: string; businessName: string | null };
  grazier: { name: string; businessName: string | null };
  block: { name: string; placeName: string | null; crop: string; acres: number };
  terms: {
    version: number;
    lbDmPerAcre: number;
    targetUtilizationPct: number;
    residualHeightIn: number | null;
    basis: ContractView['basis'];
    rate: string;
    headCount: number;
    species: ContractView['species'];
    animalClass: string;
    bodyWeightLb: number;
    startDate: string;
    endDate: string;
    outBy: string;
    services: readonly string[];
    /** The block's restrictions in words. */
    restrictions: readonly string[];
  };
  /** SHA-256 (hex) of the canonical text of the terms in force, which the signatures below are on. */
  termsSha256: string;
  signatures: readonly GrazingLogSignature[];
  /** Every entry of the log in time order, with its flags. */
  entries: ReadonlyArray<{
    at: string;
    kind: LogEntryView['kind'];
    change: number | null;
    count: number | null;
    paddock: string | null;
    residualHeightIn: number | null;
    takenPct: number | null;
    trampledPct: number | null;
    bareGroundPct: number | null;
    waterChecked: boolean | null;
    fenceChecked: boolean | null;
    losses: number | null;
    note: string | null;
    by: string;
    flags: readonly string[];
  }>;
  /** lib/grazing/log-figures over the whole log; `until` is where the head-days were counted to. */
  figures: LogFigures;
  /** The latest sign-off round and the agreed figure with both names and times (null until agreed). */
  signOff: SignOffView | null;
  agreed: { headDays: number; proposedBy: { name: string; at: string }; approvedBy: { name: string; at: string } } | null;
  /** The cautions signed with the terms; the general cautions when a contract carries none. */
  cautions: ReadonlyArray<{ tone: 'danger' | 'caution' | 'info'; title: string; text: string }>;
}

export interface GrazingLogRenderer {
  renderGrazingLog(data: GrazingLogDocumentData): Promise<Buffer>;
}

export interface StoredDocumentRef {
  id: string;
  version: number;
  /** What the file was made from (grazingLogSourceKey): a stored file is current while this matches. */
  sourceKey: string;
  sha256: string;
  sizeBytes: number;
  createdAt: string;
}

/** The documents module as contracts use it (server/modules/documents, wired by createApp). */
export interface ContractDocumentStore {
  /** The newest stored document of this kind for the contract, or null. */
  latest(kind: 'grazing-log', contractId: string): Promise<StoredDocumentRef | null>;
  /** Renders with the next version number and stores the bytes as that version. */
  storeRendered(kind: 'grazing-log', contractId: string, sourceKey: string, render: (version: number) => Promise<Buffer>): Promise<StoredDocumentRef>;
  read(doc: StoredDocumentRef): Promise<Buffer>;
}

/**
 * The data the PDF prints, from the contract view (terms, parties, cautions, sign-off), the log's entries
 * and figures, and the signatures with where they were made.
 */
export function grazingLogDocumentData(
  contract: ContractView,
  entries: readonly LogEntryView[],
  figures: LogFigures,
  signOff: SignOffView | null,
  signatures: readonly GrazingLogSignature[],
  made: { version: number; generatedAt: string },
): GrazingLogDocumentData {
  const r = contract.restrictions ?? { sprayRecords: [], earliestSafeDate: null };
  const restrictions: string[] = [];
  if (r.earliestSafeDate) {
    const binding = bindingSprayRecord(r.sprayRecords);
    restrictions.push(`No grazing before ${formatDay(r.earliestSafeDate)}${binding ? ` (${binding.product}, applied ${formatDay(binding.appliedOn)}, label: no grazing for ${binding.grazingRestrictionDays} days)` : ''}`);
  }
  for (const s of r.sprayRecords) if (s.containsCopper) restrictions.push(`Copper: ${s.product}, applied ${formatDay(s.appliedOn)}`);
  restrictions.push(`Animals out by ${formatDay(contract.outBy)}`);
  const agreedRound = signOff?.status === 'agreed' ? signOff : null;
  return {
    contractId: contract.id,
    version: made.version,
    generatedAt: made.generatedAt,
    draft: contract.agreedHeadDays == null,
    status: contract.status,
    timeZone: contract.timeZone,
    grower: { name: contract.grower.name, businessName: contract.grower.businessName },
    grazier: { name: contract.grazier.name, businessName: contract.grazier.businessName },
    block: { name: contract.block.name, placeName: contract.block.placeName, crop: contract.block.crop, acres: contract.acres },
    terms: {
      version: contract.termsVersion ?? 1,
      lbDmPerAcre: contract.lbDmPerAcre,
      targetUtilizationPct: contract.targetUtilizationPct,
      residualHeightIn: contract.residualHeightIn ?? null,
      basis: contract.basis,
      rate: contract.rate,
      headCount: contract.headCount,
      species: contract.species,
      animalClass: contract.animalClass,
      bodyWeightLb: contract.bodyWeightLb,
      startDate: contract.startDate,
      endDate: contract.endDate,
      outBy: contract.outBy,
      services: contract.services,
      restrictions,
    },
    termsSha256: contract.termsHash ?? '',
    signatures: signatures.filter((s) => s.termsVersion === contract.termsVersion),
    entries: entries.map((e) => ({
      at: e.at,
      kind: e.kind,
      change: e.change,
      count: e.count,
      paddock: e.paddock,
      residualHeightIn: e.residualHeightIn,
      takenPct: e.takenPct,
      trampledPct: e.trampledPct,
      bareGroundPct: e.bareGroundPct,
      waterChecked: e.waterChecked,
      fenceChecked: e.fenceChecked,
      losses: e.losses,
      note: e.note,
      by: e.authorName ?? '',
      flags: e.flags,
    })),
    figures,
    signOff,
    agreed:
      contract.agreedHeadDays != null && contract.agreedAt
        ? {
            headDays: contract.agreedHeadDays,
            proposedBy: {
              name: agreedRound?.agreedBy === 'grazier' ? agreedRound.grazierName : (agreedRound?.grazierName ?? contract.grazier.name),
              at: agreedRound?.agreedBy === 'grazier' ? agreedRound.agreedAt! : (agreedRound?.proposedAt ?? contract.agreedAt),
            },
            approvedBy: {
              name: agreedRound?.growerName ?? contract.grower.name,
              at: agreedRound?.agreedBy === 'grazier' ? (agreedRound.disputedAt ?? contract.agreedAt) : (agreedRound?.agreedAt ?? contract.agreedAt),
            },
          }
        : null,
    cautions: (contract.cautions?.length ? contract.cautions : GENERAL_GRAZING_CAUTIONS).map((c) => ({ tone: c.tone, title: c.title, text: c.text })),
  };
}

/** What a stored grazing log was made from: the terms version and the agreed figure. A change of either needs a new file. */
export function grazingLogSourceKey(c: Pick<Contract, 'termsVersion' | 'agreedHeadDays' | 'agreedAt' | 'status'>): string | null {
  if (c.agreedHeadDays === null || !c.agreedAt) return null;
  return `terms-v${c.termsVersion}:agreed-${c.agreedHeadDays}@${c.agreedAt.toISOString()}`;
}

async function documentData(ctx: ServiceContext, contract: Contract, made: { version: number; generatedAt: string }): Promise<GrazingLogDocumentData> {
  const em = ctx.ds.manager;
  const { terms } = await termsInForce(em, contract);
  const owner = await em.findOneByOrFail(Account, { id: contract.grazierId });
  const [view] = await contractViews(em, [contract], { viewer: owner, detail: true });
  const [entries, figures, signatures] = await Promise.all([
    allEntryViews(ctx, contract, terms),
    figuresOf(em, contract, terms, ctx.now()),
    em.find(ContractSignature, { where: { contractId: contract.id }, order: { signedAt: 'ASC' } }),
  ]);
  return grazingLogDocumentData(
    view,
    entries,
    figures,
    view.signOff ?? null,
    signatures.map((s) => ({
      role: s.party,
      typedName: s.typedName,
      signedAt: s.signedAt.toISOString(),
      termsVersion: s.termsVersion,
      termsHash: s.termsHash,
      cautionsAcknowledged: s.cautionsAcknowledged,
      ip: s.ip,
      userAgent: s.userAgent,
    })),
    made,
  );
}

/**
 * After a commit that changed the agreed record (head-days agreed, an amendment in force): render the log
 * and store it as the next version. A failure is logged and never undoes the commit; the next GET renders.
 */
export async function refreshLogDocument(ctx: ServiceContext, contractId: string): Promise<void> {
  if (!ctx.pdf || !ctx.documents) return;
  if (inOpenTransaction(ctx.ds)) throw new Error('refreshLogDocument must run after the commit, never inside a transaction');
  const { pdf, documents } = ctx;
  try {
    const contract = await ctx.ds.manager.findOneByOrFail(Contract, { id: contractId });
    const key = grazingLogSourceKey(contract);
    if (!key) return;
    const latest = await documents.latest('grazing-log', contractId);
    if (latest?.sourceKey === key) return;
    await documents.storeRendered('grazing-log', contractId, key, async (version) =>
      pdf.renderGrazingLog(await documentData(ctx, contract, { version, generatedAt: new Date(ctx.now()).toISOString() })),
    );
  } catch (err) {
    ctx.log(`[pdf] grazing log of contract ${contractId} not stored: ${err instanceof Error ? err.message : String(err)}`);
  }
}

export interface PdfFile {
  bytes: Buffer;
  fileName: string;
  version: number;
  draft: boolean;
}

/** GET …/log.pdf: the stored record when it is current, else rendered now (see the note at the top). */
export async function grazingLogPdf(ctx: ServiceContext, viewer: Account, contractId: string): Promise<PdfFile> {
  const contract = await ctx.ds.manager.findOneBy(Contract, { id: contractId });
  assertCanRead(viewer, contract);
  if (!ctx.pdf || !ctx.documents) throw new AppError(503, 'pdf_unavailable', 'The PDF service is not available on this server yet; the log itself is up to date on the screen');
  const { pdf, documents } = ctx;
  const base = `grazing-log-${contract.id.slice(0, 8)}`;
  const key = grazingLogSourceKey(contract);
  if (!key) {
    // A log still being kept: a draft, made now and not stored (it changes with every entry).
    const bytes = await pdf.renderGrazingLog(await documentData(ctx, contract, { version: 0, generatedAt: new Date(ctx.now()).toISOString() }));
    return { bytes, fileName: `${base}-draft.pdf`, version: 0, draft: true };
  }
  let doc = await documents.latest('grazing-log', contract.id);
  if (!doc || doc.sourceKey !== key) {
    // None stored for the record as it stands (the render after the commit failed, or predates this code).
    doc = await documents.storeRendered('grazing-log', contract.id, key, async (version) =>
      pdf.renderGrazingLog(await documentData(ctx, contract, { version, generatedAt: new Date(ctx.now()).toISOString() })),
    );
  }
  return { bytes: await documents.read(doc), fileName: `${base}-v${doc.version}.pdf`, version: doc.version, draft: false };
}
