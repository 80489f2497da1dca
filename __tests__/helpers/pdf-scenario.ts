import crypto from 'node:crypto';
import { addDaysToKey } from '../../lib/dates';
import { chargeLines } from '../../lib/money';
import { logDays, type LogEntryFacts } from '../../lib/grazing/log-days';
import { cautionsForBlock, sprayRestrictionEnds, type SprayRecord } from '../../lib/grazing/safety';
import { formatDay } from '../../lib/format';
import { invoiceLinesFromCharge, type GrazingLogPdfData, type InvoicePdfData } from '../../server/lib/pdf/pdf-renderer';

// An invented stay in the fictional Calder Valley district (README): Kellner Range Sheep's 600 dry ewes on
// the Olsens' north bench walnut middles, Jan 10 to Mar 2, 2027. The ewes arrive at 08:00 on Jan 10, 480
// leave at 16:00 on Feb 27 and the last 120 at 10:00 on Mar 2 — a day after the out-by date, so those
// entries are flagged. Every figure is made up; the expected totals in the tests are worked by hand.

export const TZ = 'America/Los_Angeles';
export const CONTRACT_ID = '7c1e2f4a-5b6d-4e8f-9a0b-c1d2e3f4a5b6';
export const INVOICE_ID = 'b2c3d4e5-f6a7-4b8c-9d0e-f1a2b3c4d5e6';

const spray: SprayRecord = { product: 'Dormant oil (invented label)', appliedOn: '2026-12-01', grazingRestrictionDays: 30, containsCopper: false };
// Walnut growers spray copper against blight; the label interval here is invented.
const copper: SprayRecord = { product: 'Copper hydroxide (invented label)', appliedOn: '2026-11-12', grazingRestrictionDays: 14, containsCopper: true };

const terms = {
  lbDmPerAcre: 2000,
  targetUtilizationPct: 45,
  basis: 'head-day' as const,
  rate: '0.18',
  headCount: 600,
  species: 'sheep' as const,
  animalClass: 'dry ewes',
  bodyWeightLb: 150,
  startDate: '2027-01-10',
  endDate: '2027-02-26',
  outBy: '2027-03-01',
  services: ['fencing', 'guardian dogs'],
  restrictions: [
    `No grazing before ${formatDay(sprayRestrictionEnds(spray))} (${spray.product}, applied ${formatDay(spray.appliedOn)}, label: no grazing for ${spray.grazingRestrictionDays} days)`,
    'Keep the ewes off the walnut replants in rows 40–44 (temporary fence)',
  ],
};

/** Pacific standard time all season: the stay ends before the 2027 change on Mar 14. */
const at = (day: string, time: string) => `${day}T${time}:00-08:00`;

function observation(day: string, i: number, totalDays: number): LogEntryFacts {
  // Residual falls from 6 in towards 2.5 in and the take rises towards the 45 % target over the stay.
  const share = Math.min(1, i / Math.max(1, totalDays - 1));
  return {
    // On the last day the check is made before the truck leaves at 10:00.
    at: at(day, i === totalDays - 1 ? '09:30' : '16:30'),
    kind: 'observation',
    residualHeightIn: Math.round((6 - 3.5 * share) * 2) / 2,
    takenPct: Math.round(45 * share),
    waterChecked: true,
    fenceChecked: i % 3 !== 2 ? true : null,
    note: i % 9 === 4 ? 'Moved the temporary fence two rows east; troughs filled from the orchard standpipe.' : null,
  };
}

/** The log entries of the stay: `days` days from Jan 10, `perDay` entries on each (at least one observation). */
export function scenarioEntries(days: number, perDay: number): { entries: LogEntryFacts[]; until: string } {
  const first = terms.startDate;
  const lastDay = addDaysToKey(first, days - 1);
  const entries: LogEntryFacts[] = [{ at: at(first, '08:00'), kind: 'move', change: 600, note: 'Unloaded at the north gate, two trucks.' }];
  for (let i = 0; i < days; i++) {
    const day = addDaysToKey(first, i);
    if (i % 7 === 3) {
      const count = i === 17 ? 597 : 600;
      entries.push({ at: at(day, '07:15'), kind: 'tally', count, note: count === 597 ? 'Three short at the morning count; found them in the creek bottom by noon.' : null });
    }
    for (let k = 1; k < perDay; k++) {
      entries.push({ at: at(day, `${String(7 + k).padStart(2, '0')}:40`), kind: 'observation', waterChecked: k % 2 === 1, note: k % 2 === 0 ? 'Guardian dogs settled; no predator sign.' : null });
    }
    entries.push(observation(day, i, days));
  }
  const outDay = addDaysToKey(lastDay, -3);
  entries.push({ at: at(outDay, '16:00'), kind: 'move', change: -480, note: 'Main mob loaded for the Three Terraces vineyard.' });
  entries.push({ at: at(lastDay, '10:00'), kind: 'move', change: -120, note: 'Last 120 ewes out after the rain delayed the truck.', by: 'Wade Kellner' });
  return { entries, until: at(lastDay, '10:00') };
}

export function termsSha256(): string {
  return crypto.createHash('sha256').update(JSON.stringify(terms)).digest('hex');
}

export interface StayShape {
  days: number;
  perDay: number;
  /** Moves the stay's end and out-by date (for a long stay that is not flagged throughout). */
  endDate?: string;
  outBy?: string;
}

/** The stay in the module comment: 52 days (Jan 10 – Mar 2), three entries a day. */
export function grazingLogData(over: Partial<GrazingLogPdfData> = {}, shape: StayShape = { days: 52, perDay: 3 }): GrazingLogPdfData {
  const { entries, until } = scenarioEntries(shape.days, shape.perDay);
  const stayTerms = { ...terms, endDate: shape.endDate ?? terms.endDate, outBy: shape.outBy ?? terms.outBy };
  const log = logDays({ entries, until, timeZone: TZ, outBy: stayTerms.outBy });
  return {
    contractId: CONTRACT_ID,
    version: 2,
    generatedAt: '2027-03-03T09:15:00-08:00',
    timeZone: TZ,
    grower: { name: 'Greta Olsen', businessName: 'Olsen Walnut Orchard' },
    grazier: { name: 'Wade Kellner', businessName: 'Kellner Range Sheep' },
    block: { name: 'North bench walnut middles', placeName: 'Calder Valley, north bench', crop: 'orchard', acres: 120 },
    terms: stayTerms,
    log: { days: log.days, headDays: log.headDays, until },
    signatures: [
      { role: 'grower', typedName: 'Greta M. Olsen', signedAt: '2027-01-05T09:12:00-08:00', ip: '203.0.113.24' },
      { role: 'grazier', typedName: 'Wade Kellner', signedAt: '2027-01-05T14:40:00-08:00' },
    ],
    termsSha256: termsSha256(),
    agreed: {
      headDays: log.headDays,
      proposedBy: { name: 'Wade Kellner', at: '2027-03-02T12:00:00-08:00' },
      approvedBy: { name: 'Greta Olsen', at: '2027-03-03T09:05:00-08:00' },
    },
    cautions: cautionsForBlock(
      { crop: 'orchard', sprayRecords: [spray, copper], outBy: stayTerms.outBy, harvestDate: '2027-09-20', youngPlantings: true, waterOnSite: true, speciesAllowed: ['sheep', 'goats'] },
      { species: 'sheep' },
    ),
    ...over,
  };
}

/** The invoice for that stay: 29,330 agreed head-days at $0.18 plus six loads of hauled water. */
export function invoiceData(over: Partial<InvoicePdfData> = {}): InvoicePdfData {
  const charge = chargeLines({ basis: 'head-day', quantity: 29330, rate: '0.18', feesCents: [{ label: 'Water hauling, 6 loads', amountCents: 42000 }] });
  return {
    invoiceId: INVOICE_ID,
    number: 'FF-2027-0007',
    version: 1,
    generatedAt: '2027-03-03T10:00:00-08:00',
    timeZone: TZ,
    issuedOn: '2027-03-03',
    dueOn: '2027-04-02',
    from: { name: 'Wade Kellner', businessName: 'Kellner Range Sheep', email: 'wade@calder.example', place: 'Calder Valley, south road' },
    to: { name: 'Greta Olsen', businessName: 'Olsen Walnut Orchard', email: 'greta@calder.example', place: 'Calder Valley, north bench' },
    contractId: CONTRACT_ID,
    block: { name: 'North bench walnut middles', placeName: 'Calder Valley, north bench' },
    stay: { startDate: '2027-01-10', endDate: '2027-03-02' },
    lines: invoiceLinesFromCharge(charge, 'head-day'),
    subtotalCents: charge.subtotalCents,
    totalCents: charge.totalCents,
    status: 'sent',
    paidAt: null,
    paymentTerms: 'Due within 30 days of issue. Pay by card or bank debit from the invoice in Fieldfold.',
    ...over,
  };
}
