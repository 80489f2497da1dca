import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { Block } from '../../modules/blocks/block.entity';
import { Bid } from '../../modules/bids/bid.entity';
import { validBlockRecord } from '../../modules/blocks/blocks.service';
import { validBidRecord } from '../../modules/bids/bids.service';
import { Contract } from '../../modules/contracts/contract.entity';
import { ContractSignature, LogEntry, SignOff } from '../../modules/contracts/contract-records.entity';
import { createContract, signatureRecord } from '../../modules/contracts/contracts.service';
import { figuresOf, latestSignOff, movesOf, termsInForce } from '../../modules/contracts/contract-state';
import { logEntryRow, vetLogEntry } from '../../modules/contracts/contract-log.service';
import { approvalOf, proposalRecord } from '../../modules/contracts/sign-off.service';
import { check } from '../../lib/http/validate';
import { addDaysToKey, startOfLocalDay, timeZoneOffsetMs } from '../../../lib/dates';
import { logEntrySchema, type ContractParty, type LogEntryInput } from '../../../lib/schemas/contract';
import type { BlockInput } from '../../../lib/schemas/block';
import type { BidInput } from '../../../lib/schemas/bid';
import type { DemoEmail } from './demo-market';

// The demo's contracts, dated in days from the seed's "today" so a fresh demo always has the same story:
// last season's finished stays with full grazing logs and agreed head-days (one after a dispute), one flock
// grazing now with its log up to yesterday, and one contract waiting for the grazier's signature. Every
// block, bid and log entry goes through the checks the API applies (validBlockRecord, validBidRecord,
// vetLogEntry), so the demo shows nothing the product would refuse. People, places and figures are invented.

const ZONE = 'America/Los_Angeles';

type DemoEntry = { by: ContractParty; day: number; time: string; entry: Omit<LogEntryInput, 'clientId' | 'at'> };

interface DemoStay {
  key: string;
  grower: DemoEmail;
  grazier: DemoEmail;
  block: BlockInput;
  bid: BidInput;
  /** Days from today: when the bid was placed (the day its dates were checked against) and awarded. */
  bidDay: number;
  awardDay: number;
  signatures: Array<{ party: ContractParty; day: number; time: string }>;
  log: DemoEntry[];
  signOff?: {
    day: number;
    time: string;
    comment?: string;
    answer: { kind: 'approve'; day: number; time: string } | { kind: 'counter'; less: number; comment: string; day: number; time: string; acceptDay: number; acceptTime: string };
  };
}

/** "2027-01-10T08:15:00-08:00": the local time at the district on a day `n` days from today. */
function localAt(today: string, n: number, time: string): { iso: string; ms: number } {
  const [h, m] = time.split(':').map(Number);
  const midnight = startOfLocalDay(addDaysToKey(today, n), ZONE);
  // Wall-clock time: on a day the clocks change, 07:30 is not 7.5 hours after midnight.
  const guess = midnight + (h * 60 + m) * 60_000;
  const ms = guess + timeZoneOffsetMs(midnight, ZONE) - timeZoneOffsetMs(guess, ZONE);
  const offset = timeZoneOffsetMs(ms, ZONE);
  const wall = new Date(ms + offset).toISOString().slice(0, 19);
  const sign = offset < 0 ? '-' : '+';
  const abs = Math.abs(offset) / 60_000;
  return { iso: `${wall}${sign}${String(Math.floor(abs / 60)).padStart(2, '0')}:${String(abs % 60).padStart(2, '0')}`, ms };
}

interface StayLogPlan {
  inDay: number;
  /** The day the animals leave; null while they are still on (entries then run to yesterday). */
  outDay: number | null;
  head: number;
  cells: string[];
  residualFrom: number;
  residualTo: number;
  notes: string[];
  loss?: { day: number; head: number; note: string };
  growerNotes?: Array<{ day: number; note: string; residualHeightIn?: number }>;
}

/** A stay's log as a careful grazier keeps it: the move in, a morning check every day, a cell move every third day, the move out. */
function stayLog(p: StayLogPlan): DemoEntry[] {
  const out: DemoEntry[] = [{ by: 'grazier', day: p.inDay, time: '08:10', entry: { kind: 'move', change: p.head, paddock: p.cells[0], waterChecked: true, fenceChecked: true, note: `Unloaded ${p.head} at the top gate.` } }];
  const last = (p.outDay ?? 0) - 1;
  const days = last - p.inDay;
  let head = p.head;
  for (let day = p.inDay + 1; day <= last; day++) {
    const i = day - p.inDay;
    const share = days > 0 ? i / days : 1;
    const cell = p.cells[Math.floor(i / 3) % p.cells.length];
    out.push({
      by: 'grazier',
      day,
      time: '07:30',
      entry: {
        kind: 'observation',
        paddock: cell,
        residualHeightIn: Math.round((p.residualFrom + (p.residualTo - p.residualFrom) * share) * 10) / 10,
        takenPct: Math.round(8 + 34 * share),
        trampledPct: Math.round(5 + 10 * share),
        bareGroundPct: Math.round(2 + 3 * share),
        waterChecked: true,
        fenceChecked: true,
        note: p.notes[(i - 1) % p.notes.length] || null,
      },
    });
    if (p.loss && p.loss.day === day) {
      head -= p.loss.head;
      out.push({ by: 'grazier', day, time: '09:00', entry: { kind: 'move', change: -p.loss.head, paddock: cell, note: p.loss.note } });
      out.push({ by: 'grazier', day, time: '09:05', entry: { kind: 'tally', count: head, losses: p.loss.head, paddock: cell, note: 'Counted through the gate after the loss.' } });
    }
  }
  for (const g of p.growerNotes ?? []) out.push({ by: 'grower', day: g.day, time: '15:20', entry: { kind: 'observation', note: g.note, residualHeightIn: g.residualHeightIn ?? null } });
  if (p.outDay !== null) out.push({ by: 'grazier', day: p.outDay, time: '10:30', entry: { kind: 'move', change: -head, paddock: p.cells.at(-1), note: 'Loaded out; gates shut, net rolled up.' } });
  return out;
}

const CHECK_NOTES = [
  'Trough full; dogs with the flock overnight.',
  '',
  'Reset two posts on the net after the wind.',
  'Even grazing along the middles; berms untouched.',
  '',
  'Moved the net to the next cell at first light.',
  'Frost early; flock settled by nine.',
];

export function demoStays(today: string): DemoStay[] {
  const d = (n: number) => addDaysToKey(today, n);
  return [
    // Last season: Olsen orchard and Kellner sheep, approved as proposed.
    {
      key: 'home-orchard-last-season',
      grower: 'greta@calder.example',
      grazier: 'wade@calder.example',
      block: {
        name: 'Home orchard walnut middles',
        crop: 'orchard',
        acres: 72,
        placeName: 'Calder Valley, north bench',
        latitude: 39.7141,
        longitude: -121.9318,
        forageMethod: 'direct',
        lbDmPerAcre: 2100,
        targetUtilizationPct: 45,
        residualHeightIn: 3,
        windowStart: d(-388),
        windowEnd: d(-350),
        outBy: d(-355),
        harvestDate: d(-150),
        sprayRecords: [{ product: 'Dormant oil (demo record)', appliedOn: d(-410), grazingRestrictionDays: 14, containsCopper: false }],
        waterOnSite: true,
        perimeterFence: 'full',
        truckAccess: true,
        speciesAllowed: ['sheep'],
        youngPlantings: false,
        notes: 'Last winter’s stay. Trough at the pump house.',
      },
      bid: { basis: 'head-day', rate: '0.17', headCount: 600, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: d(-380), endDate: d(-368), services: ['fencing', 'guardian dogs'] },
      bidDay: -400,
      awardDay: -396,
      signatures: [
        { party: 'grower', day: -395, time: '19:05' },
        { party: 'grazier', day: -394, time: '06:40' },
      ],
      log: stayLog({
        inDay: -380,
        outDay: -368,
        head: 600,
        cells: ['Cell 1 (rows 1–20)', 'Cell 2 (rows 21–40)', 'Cell 3 (rows 41–60)', 'Cell 4 (rows 61–80)'],
        residualFrom: 7,
        residualTo: 3.5,
        notes: CHECK_NOTES,
        growerNotes: [{ day: -374, note: 'Walked the middles: even take, trees untouched.', residualHeightIn: 4.5 }],
      }),
      signOff: { day: -368, time: '14:00', comment: 'Out on schedule.', answer: { kind: 'approve', day: -367, time: '09:15' } },
    },
    // Last season: Three Terraces and Kellner sheep; the grower counted less and the grazier accepted.
    {
      key: 'terrace-1-last-season',
      grower: 'tomas@calder.example',
      grazier: 'wade@calder.example',
      block: {
        name: 'Terrace 1 vineyard rows',
        crop: 'vineyard',
        acres: 30,
        placeName: 'Calder Valley, west slope',
        latitude: 39.6534,
        longitude: -122.0456,
        forageMethod: 'direct',
        lbDmPerAcre: 1700,
        targetUtilizationPct: 40,
        residualHeightIn: 3,
        windowStart: d(-362),
        windowEnd: d(-330),
        outBy: d(-338),
        harvestDate: d(-95),
        sprayRecords: [{ product: 'Fixed copper fungicide (demo record)', appliedOn: d(-392), grazingRestrictionDays: 21, containsCopper: true }],
        waterOnSite: true,
        perimeterFence: 'full',
        truckAccess: true,
        speciesAllowed: ['sheep'],
        youngPlantings: false,
        notes: 'Last winter’s stay, kept short for the copper.',
      },
      bid: { basis: 'head-day', rate: '0.19', headCount: 450, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 145, startDate: d(-360), endDate: d(-351), services: ['fencing', 'herding'] },
      bidDay: -372,
      awardDay: -370,
      signatures: [
        { party: 'grazier', day: -370, time: '18:30' },
        { party: 'grower', day: -369, time: '08:10' },
      ],
      log: stayLog({
        inDay: -360,
        outDay: -351,
        head: 450,
        cells: ['Rows 1–30', 'Rows 31–60'],
        residualFrom: 6,
        residualTo: 3.2,
        notes: CHECK_NOTES,
        loss: { day: -356, head: 2, note: 'Two ewes lost (bloat); carcasses removed and buried off the block.' },
      }),
      signOff: {
        day: -351,
        time: '15:30',
        answer: { kind: 'counter', less: 25, comment: 'The flock was out of rows 8–12 the last morning while the sprayer went through.', day: -350, time: '11:00', acceptDay: -350, acceptTime: '17:45' },
      },
    },
    // Last season: Olsen orchard and Haas goats, per acre.
    {
      key: 'almond-3-last-season',
      grower: 'greta@calder.example',
      grazier: 'mirela@calder.example',
      block: {
        name: 'Almond block 3 middles',
        crop: 'orchard',
        acres: 38,
        placeName: 'Calder Valley, river road',
        latitude: 39.7003,
        longitude: -121.9498,
        forageMethod: 'direct',
        lbDmPerAcre: 1900,
        targetUtilizationPct: 40,
        residualHeightIn: 3,
        windowStart: d(-404),
        windowEnd: d(-385),
        outBy: d(-388),
        harvestDate: d(-165),
        sprayRecords: [],
        waterOnSite: false,
        perimeterFence: 'none',
        truckAccess: true,
        speciesAllowed: ['sheep', 'goats'],
        youngPlantings: false,
      },
      bid: { basis: 'acre', rate: '18.00', headCount: 240, species: 'goats', animalClass: 'wethers', bodyWeightLb: 120, startDate: d(-400), endDate: d(-392), services: ['fencing', 'water hauling'] },
      bidDay: -420,
      awardDay: -417,
      signatures: [
        { party: 'grower', day: -417, time: '20:00' },
        { party: 'grazier', day: -416, time: '07:15' },
      ],
      log: stayLog({ inDay: -400, outDay: -392, head: 240, cells: ['East half', 'West half'], residualFrom: 6.5, residualTo: 3.4, notes: ['Hauled 400 gal of water.', '', 'Goats on the brush along the ditch first.'] }),
      signOff: { day: -392, time: '16:10', answer: { kind: 'approve', day: -391, time: '08:30' } },
    },
    // Now: Kellner sheep on Olsen's south bench, in since six days ago; the log runs to yesterday.
    {
      key: 'south-bench-now',
      grower: 'greta@calder.example',
      grazier: 'wade@calder.example',
      block: {
        name: 'South bench walnut middles',
        crop: 'orchard',
        acres: 64,
        placeName: 'Calder Valley, south bench',
        latitude: 39.7052,
        longitude: -121.9239,
        forageMethod: 'direct',
        lbDmPerAcre: 2200,
        targetUtilizationPct: 45,
        residualHeightIn: 3,
        windowStart: d(-10),
        windowEnd: d(20),
        outBy: d(16),
        harvestDate: d(250),
        sprayRecords: [{ product: 'Dormant oil (demo record)', appliedOn: d(-40), grazingRestrictionDays: 14, containsCopper: false }],
        waterOnSite: true,
        perimeterFence: 'partial',
        truckAccess: true,
        speciesAllowed: ['sheep'],
        youngPlantings: false,
        notes: 'Replants by the well are netted off.',
      },
      bid: { basis: 'head-day', rate: '0.18', headCount: 600, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: d(-6), endDate: d(8), services: ['fencing', 'herding', 'guardian dogs'] },
      bidDay: -25,
      awardDay: -20,
      signatures: [
        { party: 'grower', day: -19, time: '18:00' },
        { party: 'grazier', day: -18, time: '06:55' },
      ],
      log: stayLog({
        inDay: -6,
        outDay: null,
        head: 600,
        cells: ['Cell 1 (rows 1–16)', 'Cell 2 (rows 17–32)', 'Cell 3 (rows 33–48)'],
        residualFrom: 7.5,
        residualTo: 5,
        notes: CHECK_NOTES,
        loss: { day: -3, head: 2, note: 'Two ewes lost to a loose dog overnight; reported to the county; carcasses removed.' },
        growerNotes: [{ day: -2, note: 'Good even take in cell 1. Please keep clear of the replants by the well.' }],
      }),
    },
    // Waiting: Haas goats on Three Terraces' lower rows; the grower has signed, the grazier has not.
    {
      key: 'lower-terrace-to-sign',
      grower: 'tomas@calder.example',
      grazier: 'mirela@calder.example',
      block: {
        name: 'Lower terrace vineyard rows',
        crop: 'vineyard',
        acres: 28,
        placeName: 'Calder Valley, west slope',
        latitude: 39.6497,
        longitude: -122.0402,
        forageMethod: 'direct',
        lbDmPerAcre: 1600,
        targetUtilizationPct: 40,
        residualHeightIn: 3,
        windowStart: d(10),
        windowEnd: d(50),
        outBy: d(45),
        harvestDate: d(270),
        sprayRecords: [],
        waterOnSite: true,
        perimeterFence: 'full',
        truckAccess: true,
        speciesAllowed: ['sheep', 'goats'],
        youngPlantings: false,
      },
      bid: { basis: 'head-day', rate: '0.22', headCount: 240, species: 'goats', animalClass: 'wethers', bodyWeightLb: 120, startDate: d(12), endDate: d(30), services: ['fencing', 'herding'] },
      bidDay: -6,
      awardDay: -2,
      signatures: [{ party: 'grower', day: -1, time: '19:40' }],
      log: [],
    },
  ];
}

/** Writes one stay inside the seed's transaction, each step as the API would have made it. */
export async function seedStay(tx: EntityManager, ids: Map<string, string>, stay: DemoStay, today: string, nowMs: number): Promise<void> {
  const at = (n: number, time: string) => localAt(today, n, time);
  const when = (n: number, time: string) => new Date(at(n, time).ms);
  const record = await validBlockRecord(stay.block);
  const block = tx.create(Block, {
    id: crypto.randomUUID(),
    ownerId: ids.get(stay.grower)!,
    status: 'awarded',
    publishedAt: when(stay.bidDay - 3, '09:00'),
    awardedAt: when(stay.awardDay, '12:00'),
    ...record,
  });
  await tx.insert(Block, block);
  const bid = tx.create(Bid, {
    id: crypto.randomUUID(),
    blockId: block.id,
    grazierId: ids.get(stay.grazier)!,
    status: 'accepted',
    decidedAt: when(stay.awardDay, '12:00'),
    ...(await validBidRecord(stay.bid, block, addDaysToKey(today, stay.bidDay))),
  });
  await tx.insert(Bid, bid);
  const contract = await createContract(tx, block, bid);
  await tx.update(Contract, { id: contract.id }, { createdAt: when(stay.awardDay, '12:00') });

  const { terms, hash } = await termsInForce(tx, contract);
  for (const s of stay.signatures) {
    const party = s.party;
    const input = { termsHash: hash, typedName: terms[party].name, cautionsAcknowledged: true as const };
    await tx.insert(
      ContractSignature,
      signatureRecord({ contractId: contract.id, termsVersion: 1, party, accountId: party === 'grower' ? contract.growerId : contract.grazierId, input, termsHash: hash, origin: { ip: null, userAgent: 'Fieldfold demo seed' }, at: when(s.day, s.time) }),
    );
  }
  if (stay.signatures.length < 2) return;
  contract.status = 'signed';
  await tx.update(Contract, { id: contract.id }, { status: 'signed' });

  const entries = stay.log.map((e) => ({ ...e, when: at(e.day, e.time) })).sort((a, b) => a.when.ms - b.when.ms);
  for (const [i, e] of entries.entries()) {
    const input = (await check(logEntrySchema, { clientId: `demo-${stay.key}-${i}`, at: e.when.iso, ...e.entry })) as LogEntryInput;
    const { atMs, flags } = vetLogEntry(input, { party: e.by, status: contract.status, latest: null, terms, nowMs, moves: await movesOf(tx, contract.id) });
    const authorId = e.by === 'grower' ? contract.growerId : contract.grazierId;
    await tx.insert(LogEntry, logEntryRow(input, { contractId: contract.id, party: e.by, authorId, atMs, flags, recordedAt: new Date(atMs + 4 * 60_000) }));
    if (contract.status === 'signed' && input.kind === 'move' && input.change! > 0) {
      contract.status = 'grazing';
      await tx.update(Contract, { id: contract.id }, { status: 'grazing', grazingStartedAt: new Date(atMs) });
    }
  }

  if (!stay.signOff) return;
  const so = stay.signOff;
  const figures = await figuresOf(tx, contract, terms, at(so.day, so.time).ms);
  const names = { grazier: terms.grazier.name, grower: terms.grower.name };
  const round = proposalRecord({
    contractId: contract.id,
    round: ((await latestSignOff(tx, contract.id))?.round ?? 0) + 1,
    figures,
    grazierName: names.grazier,
    comment: so.comment ?? null,
    at: when(so.day, so.time),
  });
  const a = so.answer;
  // The grower's counter, kept to the 4 decimals head-days carry.
  const less = (n: number) => Math.round((round.proposedHeadDays - n) * 10_000) / 10_000;
  if (a.kind === 'approve') {
    Object.assign(round, approvalOf(round, names.grower, when(a.day, a.time)));
  } else {
    Object.assign(round, {
      status: 'agreed',
      counterHeadDays: less(a.less),
      disputeComment: a.comment,
      disputedAt: when(a.day, a.time),
      growerName: names.grower,
      agreedHeadDays: less(a.less),
      agreedAt: when(a.acceptDay, a.acceptTime),
      agreedBy: 'grazier',
    });
  }
  await tx.insert(SignOff, round);
  await tx.update(Contract, { id: contract.id }, { status: 'agreed', agreedHeadDays: round.agreedHeadDays, agreedAt: round.agreedAt });
}
