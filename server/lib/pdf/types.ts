import type { ChargeBasis } from '../../../lib/money';
import type { FlockSpecies } from '../../../lib/grazing/flock-intake';
import type { LogDay } from '../../../lib/grazing/log-days';

// Plain data the PDF renderer prints. Callers (contracts, invoices) build it from their records; the
// renderer computes nothing the product decides (head-days, money) beyond what it must print from them,
// and checks that the figures it is given agree with each other before it prints a record.
// Instants are ISO 8601 with offset; days are 'YYYY-MM-DD'; money is integer cents; rates are decimal
// dollar strings, as in shared/API.md.

export interface PdfParty {
  name: string;
  businessName: string | null;
}

export interface PdfBlock {
  name: string;
  placeName: string | null;
  /** The block's crop as the grower chose it ("orchard", "vineyard" …). */
  crop: string;
  acres: number;
}

/** The agreed terms of a contract as they are printed (copied from the contract row). */
export interface PdfContractTerms {
  lbDmPerAcre: number;
  targetUtilizationPct: number;
  basis: ChargeBasis;
  /** Dollars per unit, decimal text ("0.18"). */
  rate: string;
  headCount: number;
  species: FlockSpecies;
  animalClass: string;
  bodyWeightLb: number;
  startDate: string;
  endDate: string;
  outBy: string;
  services: readonly string[];
  /** The block's restrictions in words, e.g. "No grazing before Jan 9, 2027 (label of …)". */
  restrictions: readonly string[];
}

export interface PdfSignature {
  role: 'grower' | 'grazier';
  /** The name the person typed when signing. */
  typedName: string;
  signedAt: string;
  /** Where the signature came from, if the contracts module keeps it. */
  ip?: string | null;
}

export interface PdfAgreedHeadDays {
  headDays: number;
  proposedBy: { name: string; at: string };
  approvedBy: { name: string; at: string };
}

export interface PdfCaution {
  tone: 'danger' | 'caution' | 'info';
  title: string;
  text: string;
}

export interface GrazingLogPdfData {
  contractId: string;
  /** The version this file is stored as (storeRenderedDocument hands it to the render callback). */
  version: number;
  /** When the file is made; also the PDF's CreationDate, so the same data gives the same bytes. */
  generatedAt: string;
  /** The block's IANA zone: every time on the record is printed in it. */
  timeZone: string;
  grower: PdfParty;
  grazier: PdfParty;
  block: PdfBlock;
  terms: PdfContractTerms;
  /** lib/grazing/log-days logDays(): the days and the total head-days from the moves. */
  log: { days: readonly LogDay[]; headDays: number; until: string };
  signatures: readonly PdfSignature[];
  /** SHA-256 (hex) of the signed terms, as the contracts module computed it at signing. */
  termsSha256: string | null;
  /** Head-days both parties agreed at sign-off; null while not agreed. */
  agreed: PdfAgreedHeadDays | null;
  /** The block's cautions (lib/grazing/safety cautionsForBlock); when empty, the general cautions are printed. */
  cautions: readonly PdfCaution[];
}

export interface InvoicePdfParty extends PdfParty {
  email?: string | null;
  phone?: string | null;
  place?: string | null;
}

export interface InvoicePdfLine {
  kind: 'grazing' | 'fee';
  description: string;
  quantity: number;
  /** What the quantity counts: "head-days", "acres", "job" (lib/rates BASIS_QUANTITY_UNIT). */
  unit: string;
  /** Dollars per unit, decimal text ("0.18"); for a fee its amount ("25.00"). */
  rate: string;
  amountCents: number;
}

export type InvoicePdfStatus = 'sent' | 'paid';

export interface InvoicePdfData {
  invoiceId: string;
  /** The invoice number people quote ("FF-2027-0004"). */
  number: string;
  version: number;
  generatedAt: string;
  timeZone: string;
  issuedOn: string;
  dueOn: string;
  /** The grazier who is paid. */
  from: InvoicePdfParty;
  /** The grower who pays. */
  to: InvoicePdfParty;
  contractId: string;
  block: { name: string; placeName: string | null };
  /** The stay the invoice covers, 'YYYY-MM-DD' both. */
  stay: { startDate: string; endDate: string } | null;
  lines: readonly InvoicePdfLine[];
  /** The grazing lines (lib/money chargeLines subtotalCents). */
  subtotalCents: number;
  /** Grazing lines plus fees. */
  totalCents: number;
  status: InvoicePdfStatus;
  /** When the payment was confirmed (ISO instant); required when status is 'paid'. */
  paidAt?: string | null;
  paymentTerms: string;
}
