import { bindingSprayRecord, cautionsForBlock, earliestSafeDate, sprayRestrictionEnds, type Caution, type CautionBlock, type SprayRecord } from './grazing/safety';
import type { BidTermsView } from './schemas/bid';
import type { BlockCrop, GrazingSpecies, PerimeterFence } from './schemas/block';
import { formatDay } from './format';
import { BASIS_OPTIONS, formatRate, pickTerms } from './terms';

// What a contract's parties sign: the terms snapshot (copied from the block and the winning bid at award,
// changed only by an amendment both sign) and its canonical text. The text is a deterministic rendering —
// the same terms always give the same characters on every platform (no locale formatting, Unicode NFC,
// '\n' line ends) — so the SHA-256 the server stores with each signature can be recomputed from the terms
// by anyone holding them, and shown on the screen and the PDF beside the names.

export interface TermsParty {
  name: string;
  businessName: string | null;
}

/** The block as it stood at the award: the figures the estimate rests on and the facts the cautions come from. */
export interface TermsBlock {
  name: string;
  crop: BlockCrop;
  placeName: string | null;
  acres: number;
  lbDmPerAcre: number;
  targetUtilizationPct: number;
  /** Stubble the grower wants left, inches; null when the grower set only a take. */
  residualHeightIn: number | null;
  /** IANA zone every day of the contract is counted in. */
  timeZone: string;
  harvestDate: string | null;
  waterOnSite: boolean;
  perimeterFence: PerimeterFence;
  truckAccess: boolean;
  youngPlantings: boolean;
  speciesAllowed: GrazingSpecies[];
}

export interface ContractTerms extends BidTermsView {
  contractId: string;
  /** 1 at award, +1 for each amendment both parties signed. */
  version: number;
  grower: TermsParty;
  grazier: TermsParty;
  block: TermsBlock;
  /** Animals off the block by the end of this day (before harvest, bloom or bud break). */
  outBy: string;
  /** The spray records (label grazing restrictions) as the grower entered them, and the safe day they set. */
  restrictions: { sprayRecords: SprayRecord[]; earliestSafeDate: string | null };
  /** The cautions shown with these terms (lib/grazing/safety cautionsForBlock for the contract's species). */
  cautions: Caution[];
}

/** The terms an amendment may change (lib/schemas/contract amendmentSchema). */
export const AMENDABLE_TERMS = ['headCount', 'startDate', 'endDate', 'outBy', 'basis', 'rate'] as const;
export type AmendableTerm = (typeof AMENDABLE_TERMS)[number];
export type TermChanges = Partial<Pick<ContractTerms, AmendableTerm>>;

export const AMENDABLE_TERM_LABELS: Record<AmendableTerm, string> = {
  headCount: 'Head',
  startDate: 'Animals in',
  endDate: 'Animals out',
  outBy: 'Animals out by',
  basis: 'Pricing basis',
  rate: 'Rate',
};

function cautionBlockOf(block: TermsBlock, sprayRecords: SprayRecord[], outBy: string): CautionBlock {
  return {
    crop: block.crop,
    sprayRecords,
    outBy,
    harvestDate: block.harvestDate,
    youngPlantings: block.youngPlantings,
    waterOnSite: block.waterOnSite,
    speciesAllowed: block.speciesAllowed,
  };
}

export interface AwardFacts {
  contractId: string;
  grower: TermsParty;
  grazier: TermsParty;
  block: TermsBlock & { outBy: string; sprayRecords: SprayRecord[] };
  bid: BidTermsView;
}

/** Version 1 of the terms, at award: the bid's terms, the block's figures, restrictions and cautions. */
export function termsFromAward(f: AwardFacts): ContractTerms {
  const { outBy, sprayRecords, ...block } = f.block;
  const bid = pickTerms(f.bid);
  return {
    contractId: f.contractId,
    version: 1,
    grower: { ...f.grower },
    grazier: { ...f.grazier },
    block: { ...block, speciesAllowed: [...block.speciesAllowed] },
    ...bid,
    outBy,
    restrictions: { sprayRecords: sprayRecords.map((r) => ({ ...r })), earliestSafeDate: earliestSafeDate(sprayRecords) },
    cautions: cautionsForBlock(cautionBlockOf(block, sprayRecords, outBy), { species: bid.species }),
  };
}

/** The terms after an amendment: the changed fields, the next version, and the cautions said again (they name the out-by date). */
export function amendTerms(terms: ContractTerms, changes: TermChanges): ContractTerms {
  const next: ContractTerms = { ...terms, ...changes, version: terms.version + 1 };
  next.cautions = cautionsForBlock(cautionBlockOf(terms.block, terms.restrictions.sprayRecords, next.outBy), { species: next.species });
  return next;
}

/** Fields whose value differs between two versions of the terms, in the order an amendment lists them. */
export function changedTerms(from: ContractTerms, to: TermChanges): Array<{ field: AmendableTerm; label: string; from: string; to: string }> {
  const out: Array<{ field: AmendableTerm; label: string; from: string; to: string }> = [];
  for (const field of AMENDABLE_TERMS) {
    const v = to[field];
    if (v === undefined || v === from[field]) continue;
    out.push({ field, label: AMENDABLE_TERM_LABELS[field], from: termValueText(from, field), to: termValueText({ ...from, ...to }, field) });
  }
  return out;
}

function termValueText(t: Pick<ContractTerms, AmendableTerm>, field: AmendableTerm): string {
  switch (field) {
    case 'headCount':
      return `${t.headCount} head`;
    case 'startDate':
    case 'endDate':
    case 'outBy':
      return formatDay(t[field]);
    case 'basis':
      return BASIS_OPTIONS.find((o) => o.value === t.basis)?.label ?? t.basis;
    case 'rate':
      return formatRate(t.basis, t.rate);
  }
}

// ——— the canonical text ———

/** One line of typed text: NFC, control characters and line breaks collapsed to a space, trimmed. */
function clean(s: string): string {
  // eslint-disable-next-line no-control-regex
  return s.normalize('NFC').replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, ' ').trim();
}

function party(p: TermsParty): string {
  return p.businessName ? `${clean(p.businessName)} (${clean(p.name)})` : clean(p.name);
}

/** "2027-01-10 (Jan 10, 2027)": the ISO day that counts and the way people read it. */
function dayText(key: string | null): string {
  return key ? `${key} (${formatDay(key)})` : 'not given';
}

function yesNo(v: boolean): string {
  return v ? 'yes' : 'no';
}

/**
 * The terms as the text both parties sign. Numbers are written with JavaScript's shortest round-trip form
 * (`String(n)`, fixed by the ECMAScript spec), never with locale grouping, so the text — and its hash — is
 * the same on every device.
 */
export function canonicalTermsText(t: ContractTerms): string {
  const lines: string[] = [
    'FIELDFOLD GRAZING CONTRACT',
    `Contract: ${t.contractId}`,
    `Terms version: ${t.version}`,
    '',
    `Grower: ${party(t.grower)}`,
    `Grazier: ${party(t.grazier)}`,
    '',
    `Block: ${clean(t.block.name)}`,
    `Place: ${t.block.placeName ? clean(t.block.placeName) : 'not given'}`,
    `Crop: ${t.block.crop}`,
    `Acres: ${String(t.block.acres)}`,
    `Standing forage: ${String(t.block.lbDmPerAcre)} lb dry matter per acre`,
    `Target take: ${String(t.block.targetUtilizationPct)} % of the standing forage`,
    `Residual to leave: ${t.block.residualHeightIn == null ? 'not set' : `${String(t.block.residualHeightIn)} in`}`,
    `Days are counted in: ${t.block.timeZone}`,
    '',
    `Price: ${formatRate(t.basis, t.rate)}`,
    `Head: ${String(t.headCount)}`,
    `Species: ${t.species}`,
    `Class: ${t.animalClass}`,
    `Typical body weight: ${String(t.bodyWeightLb)} lb`,
    `Animals in: ${dayText(t.startDate)}`,
    `Animals out: ${dayText(t.endDate)}`,
    `Animals out by: ${dayText(t.outBy)}`,
    `Services by the grazier: ${t.services.length ? t.services.join(', ') : 'none'}`,
    '',
    'Restrictions:',
    `- Earliest safe grazing day by the spray records: ${dayText(t.restrictions.earliestSafeDate)}`,
    ...t.restrictions.sprayRecords.map(
      (r) =>
        `- Spray: ${clean(r.product)}, applied ${r.appliedOn}, label: no grazing for ${String(r.grazingRestrictionDays)} days (until ${sprayRestrictionEnds(r)}), copper: ${yesNo(r.containsCopper)}`,
    ),
    `- Species allowed on the block: ${t.block.speciesAllowed.join(', ')}`,
    `- Harvest: ${dayText(t.block.harvestDate)}`,
    `- Young plantings: ${yesNo(t.block.youngPlantings)}`,
    `- Water on site: ${yesNo(t.block.waterOnSite)}`,
    `- Perimeter fence: ${t.block.perimeterFence}`,
    `- Truck access: ${yesNo(t.block.truckAccess)}`,
    '',
    'Cautions shown with these terms (they defer to the pesticide label, local rules and licensed advice):',
    ...t.cautions.flatMap((c, i) => [`${i + 1}. [${c.tone}] ${clean(c.title)}`, `   ${clean(c.text)}`]),
  ];
  return lines.join('\n') + '\n';
}

/** The spray record that sets the earliest safe day, for a sentence beside it (or null). */
export function bindingRestriction(t: ContractTerms): SprayRecord | null {
  return bindingSprayRecord(t.restrictions.sprayRecords);
}
