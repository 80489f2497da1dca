import { readTogether } from '../../lib/db/reads';
import { inOpenTransaction, inTransaction } from '../../lib/db/transaction';
import type { ServiceContext } from '../../lib/service-context';
import type { GrazingLogPdfData, PdfSignature } from '../../lib/pdf/pdf-renderer';
import { Account } from '../accounts/account.entity';
import { Document, storeRenderedDocument } from '../documents/documents.service';
import { Contract } from './contract.entity';
import { ContractSignature } from './contract-records.entity';
import { figuresOf, termsInForce } from './contract-state';
import { contractViews } from './contract-views';
import { assertCanRead } from './contracts.policy';
import { allEntryViews } from './contract-log.service';
import { localDateKey, parseIsoInstant } from '../../../lib/dates';
import { formatDay } from '../../../lib/format';
import { logDays, type LogEntryFacts } from '../../../lib/grazing/log-days';
import { afterEndDateFlag } from '../../../lib/grazing/log-figures';
import { bindingSprayRecord } from '../../../lib/grazing/safety';
import type { ContractView, LogEntryView, LogFigures, SignOffView } from '../../../lib/schemas/contract';

// The grazing log as a PDF for both parties' files (server/lib/pdf renders it, server/modules/documents
// stores its versions). Rendering is a side effect: it never runs inside a write transaction, and as far as
// it can it stays off the request path of a read. When the head-days are agreed, or an amendment both signed
// takes effect, the use case renders the record after its commit and stores it as the next version
// (refreshLogDocument); GET …/log.pdf then serves that stored file. It renders on demand only when no stored
// file shows the contract as it stands — before the head-days are agreed (a draft of a log still being kept,
// never stored, since it changes with every entry), or when the render after a commit failed (the commit
// stood; the file is made on the first request instead).

/** A signature as the record prints it: who, when, from where, on which terms. */
export interface LogSignature extends PdfSignature {
  termsVersion: number;
  termsHash: string;
}

function restrictionsInWords(c: ContractView): string[] {
  const r = c.restrictions ?? { sprayRecords: [], earliestSafeDate: null };
  const out: string[] = [];
  const binding = bindingSprayRecord(r.sprayRecords);
  if (r.earliestSafeDate && binding) {
    out.push(`No grazing before ${formatDay(r.earliestSafeDate)} (${binding.product}, applied ${formatDay(binding.appliedOn)}, label: no grazing for ${binding.grazingRestrictionDays} days)`);
  }
  for (const s of r.sprayRecords) if (s.containsCopper) out.push(`Copper sprayed: ${s.product}, applied ${formatDay(s.appliedOn)} — keep the stay short for sheep`);
  if (c.residualHeightIn != null) out.push(`Leave at least ${c.residualHeightIn} in of residual`);
  return out;
}

/**
 * An entry as the printed log takes it. lib/grazing/log-days adds the after-out-by and tally flags itself,
 * so only the flags it cannot know go with it: voided, and after the agreed end date. A voided entry is
 * printed as a note of what it was, so it stays on the record and counts for nothing.
 */
function entryFacts(e: LogEntryView, c: ContractView): LogEntryFacts {
  const day = localDateKey(parseIsoInstant(e.at)!, c.timeZone);
  const flags = [...(e.voided ? [`Voided: ${e.voided.reason}`] : []), ...(day > c.endDate && day <= c.outBy ? [afterEndDateFlag(c.endDate)] : [])];
  const facts: LogEntryFacts = {
    at: e.at,
    kind: e.kind,
    change: e.change,
    count: e.count,
    residualHeightIn: e.residualHeightIn,
    takenPct: e.takenPct,
    waterChecked: e.waterChecked,
    fenceChecked: e.fenceChecked,
    note: [e.paddock, e.losses ? `${e.losses} lost` : null, e.note].filter(Boolean).join(' · ') || null,
    by: e.authorName ?? null,
    flags,
  };
  if (!e.voided) return facts;
  const what = e.kind === 'move' ? `move ${e.change! > 0 ? '+' : ''}${e.change}` : e.kind === 'tally' ? `tally of ${e.count}` : 'observation';
  return { ...facts, kind: 'observation', change: null, count: null, note: `Voided ${what}${facts.note ? `: ${facts.note}` : ''}` };
}

/**
 * The data the grazing-log PDF prints, from the contract view (terms, parties, cautions, hash), the log's
 * entries and figures, the latest sign-off round and the signatures on the terms in force.
 */
export function grazingLogDocumentData(
  contract: ContractView,
  entries: readonly LogEntryView[],
  figures: LogFigures,
  signOff: SignOffView | null,
  signatures: readonly LogSignature[],
  made: { version: number; generatedAt: string },
): GrazingLogPdfData {
  const until = figures.until ?? made.generatedAt;
  const days = logDays({ entries: entries.map((e) => entryFacts(e, contract)), until, timeZone: contract.timeZone, outBy: contract.outBy });
  const agreedRound = signOff?.status === 'agreed' ? signOff : null;
  const agreedAt = contract.agreedAt ?? agreedRound?.agreedAt ?? null;
  return {
    contractId: contract.id,
    version: made.version,
    generatedAt: made.generatedAt,
    timeZone: contract.timeZone,
    grower: { name: contract.grower.name, businessName: contract.grower.businessName },
    grazier: { name: contract.grazier.name, businessName: contract.grazier.businessName },
    block: { name: contract.block.name, placeName: contract.block.placeName, crop: contract.block.crop, acres: contract.acres },
    terms: {
      lbDmPerAcre: contract.lbDmPerAcre,
      targetUtilizationPct: contract.targetUtilizationPct,
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
      restrictions: restrictionsInWords(contract),
    },
    log: { days: days.days, headDays: days.headDays, until },
    signatures: signatures.filter((s) => s.termsVersion === contract.termsVersion).map(({ role, typedName, signedAt, ip }) => ({ role, typedName, signedAt, ip })),
    termsSha256: contract.termsHash ?? null,
    agreed:
      contract.agreedHeadDays != null && agreedAt
        ? {
            headDays: contract.agreedHeadDays,
            // Approved: the grazier proposed, the grower approved. Counter accepted: the grower proposed the figure, the grazier accepted it.
            proposedBy:
              agreedRound?.agreedBy === 'grazier'
                ? { name: agreedRound.growerName ?? contract.grower.name, at: agreedRound.disputedAt ?? agreedAt }
                : { name: agreedRound?.grazierName ?? contract.grazier.name, at: agreedRound?.proposedAt ?? agreedAt },
            approvedBy:
              agreedRound?.agreedBy === 'grazier'
                ? { name: agreedRound.grazierName, at: agreedRound.agreedAt ?? agreedAt }
                : { name: agreedRound?.growerName ?? contract.grower.name, at: agreedRound?.agreedAt ?? agreedAt },
          }
        : null,
    cautions: (contract.cautions ?? []).map((c) => ({ tone: c.tone, title: c.title, text: c.text })),
  };
}

/** What a stored grazing log was made from: the terms version and the agreed figure. A change of either needs a new file. */
export function grazingLogSourceKey(c: Pick<Contract, 'termsVersion' | 'agreedHeadDays' | 'agreedAt'>): string | null {
  if (c.agreedHeadDays === null || !c.agreedAt) return null;
  return `terms-v${c.termsVersion}:agreed-${c.agreedHeadDays}@${c.agreedAt.toISOString()}`;
}

/** What the grazing-log PDF of `contract` prints, read from the database (the renderer's input). */
export async function grazingLogPdfData(ctx: ServiceContext, contract: Contract, made: { version: number; generatedAt: string }): Promise<GrazingLogPdfData> {
  const em = ctx.ds.manager;
  const { terms } = await termsInForce(em, contract);
  const owner = await em.findOneByOrFail(Account, { id: contract.grazierId });
  const [view] = await contractViews(em, [contract], { viewer: owner, detail: true });
  const [entries, figures, signatures] = await readTogether(em, [
    () => allEntryViews(ctx, contract, terms),
    () => figuresOf(em, contract, terms, ctx.now()),
    () => em.find(ContractSignature, { where: { contractId: contract.id }, order: { signedAt: 'ASC' } }),
  ]);
  return grazingLogDocumentData(
    view,
    entries,
    figures,
    view.signOff ?? null,
    signatures.map((s) => ({ role: s.party, typedName: s.typedName, signedAt: s.signedAt.toISOString(), ip: s.ip, termsVersion: s.termsVersion, termsHash: s.termsHash })),
    made,
  );
}

/** Renders and stores the next version, and marks it on the contract as the file for the record as it stands. */
async function storeLog(ctx: ServiceContext, contract: Contract, key: string): Promise<Document> {
  const doc = await storeRenderedDocument(ctx, {
    kind: 'grazing-log',
    contractId: contract.id,
    render: async (version) => ctx.pdf.renderGrazingLog(await grazingLogPdfData(ctx, contract, { version, generatedAt: new Date(ctx.now()).toISOString() })),
  });
  // Only while the record is still the one rendered: a change meanwhile leaves the key stale, so the next read renders again.
  await inTransaction(ctx.ds, (tx) =>
    tx
      .createQueryBuilder()
      .update(Contract)
      .set({ logDocumentId: doc.id, logDocumentKey: key })
      .where('id = :id AND terms_version = :v AND agreed_head_days = :h', { id: contract.id, v: contract.termsVersion, h: contract.agreedHeadDays })
      .execute(),
  );
  return doc;
}

/**
 * After a commit that changed the agreed record (head-days agreed, an amendment in force): render the log
 * and store it as the next version. A failure is logged and never undoes the commit; the next GET renders.
 */
export async function refreshLogDocument(ctx: ServiceContext, contractId: string): Promise<void> {
  if (inOpenTransaction(ctx.ds)) throw new Error('refreshLogDocument must run after the commit, never inside a transaction');
  try {
    const contract = await ctx.ds.manager.findOneByOrFail(Contract, { id: contractId });
    const key = grazingLogSourceKey(contract);
    if (!key || contract.logDocumentKey === key) return;
    await storeLog(ctx, contract, key);
  } catch (err) {
    ctx.log(`[pdf] grazing log of contract ${contractId} not stored: ${err instanceof Error ? err.message : String(err)}`);
  }
}

export type GrazingLogFile = { stored: Document } | { draft: Buffer; fileName: string };

/** GET …/log.pdf: the stored record when it is current, else rendered now (see the note at the top). */
export async function grazingLogPdf(ctx: ServiceContext, viewer: Account, contractId: string): Promise<GrazingLogFile> {
  const em = ctx.ds.manager;
  const contract = await em.findOneBy(Contract, { id: contractId });
  assertCanRead(viewer, contract);
  const key = grazingLogSourceKey(contract);
  if (!key) {
    // A log still being kept: a draft, made now and not stored (it changes with every entry).
    const bytes = await ctx.pdf.renderGrazingLog(await grazingLogPdfData(ctx, contract, { version: 0, generatedAt: new Date(ctx.now()).toISOString() }));
    return { draft: bytes, fileName: `fieldfold-grazing-log-${contract.id.slice(0, 8)}-draft.pdf` };
  }
  const current = contract.logDocumentKey === key && contract.logDocumentId ? await em.findOneBy(Document, { id: contract.logDocumentId }) : null;
  // None stored for the record as it stands (the render after the commit failed, or came before this code).
  return { stored: current ?? (await storeLog(ctx, contract, key)) };
}
