// The large invented season `npm run bench` measures: 10 000 open blocks, 50 000 bids, 1 000 contracts signed by
// both parties with 100 000 grazing-log entries, several hundred of them signed off, invoiced and partly paid.
// Rows are made by the server's own record builders and checks from build/server (validBlockRecord,
// validBidRecord, termsOfAward, contractRecord, signatureRecord, vetLogEntry, logEntryRow) and written straight
// into the database in one transaction (prepared statements on SQLite, multi-row INSERTs on PostgreSQL); the sign-off, the invoices and the payments of finished stays then run through
// the services themselves (signOff, createInvoice, payInvoice) on a clock set to when each happened, with the
// payments fake in this process — so every row is one the product would have written. People, blocks and figures
// are invented.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { createRequire } from 'node:module';
import { root } from '../lib.mjs';

const require = createRequire(import.meta.url);
const server = (p) => require(path.join(root, 'build/server', p));
const shared = (p) => require(path.join(root, 'build/lib', p));

export const SEASON = { openBlocks: 10_000, otherBlocks: 1_000, bids: 50_000, contracts: 1_000, logEntries: 100_000, growers: 400, graziers: 300 };
export const PASSWORD = 'bench-season-password';
const ZONE = 'America/Los_Angeles';
/** Contracts 2 … INVOICED_UNTIL − 1 are finished, signed off and invoiced; from there on the flocks are still grazing. */
const INVOICED_UNTIL = 450;
/** Of the invoiced ones, those before this go to the measured grower (so their invoice list runs to several pages). */
const MEASURED_GROWER_UNTIL = 202;

/** Deterministic pseudo-random numbers (mulberry32). */
function prng(seed) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return { next, int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)), pick: (xs) => xs[Math.floor(next() * xs.length)], chance: (p) => next() < p };
}

/** An INSERT for `entity` built from TypeORM's own metadata and value conversion, so the bench never drifts from the schema. */
function inserter(ds, db, entity) {
  const meta = ds.getMetadata(entity);
  const cols = meta.columns;
  const stmt = db.prepare(`INSERT INTO "${meta.tableName}" (${cols.map((c) => `"${c.databaseName}"`).join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`);
  return (row) => {
    const missing = cols.find((c) => row[c.propertyName] === undefined && !c.isNullable && c.default === undefined && !c.isCreateDate && !c.isUpdateDate);
    if (missing) throw new Error(`bench seed: ${meta.tableName}.${missing.databaseName} has no value`);
    return stmt.run(cols.map((c) => ds.driver.preparePersistentValue(row[c.propertyName] ?? (c.isCreateDate || c.isUpdateDate ? new Date() : undefined), c) ?? null));
  };
}

/** `dbFile` is a SQLite file or a postgres:// URL (an empty database); `dataDir` holds the uploads and documents. */
export async function seedSeason(dbFile, dataDir) {
  const { openDatabase } = server('db/data-source.js');
  const { validBlockRecord } = server('modules/blocks/blocks.service.js');
  const { validBidRecord } = server('modules/bids/bids.service.js');
  const { termsOfAward } = server('modules/contracts/contract-state.js');
  const { contractRecord, signatureRecord } = server('modules/contracts/contracts.service.js');
  const { logEntryRow, vetLogEntry } = server('modules/contracts/contract-log.service.js');
  const { check } = server('lib/http/validate.js');
  const { Account } = server('modules/accounts/account.entity.js');
  const { Block } = server('modules/blocks/block.entity.js');
  const { Bid } = server('modules/bids/bid.entity.js');
  const { Contract } = server('modules/contracts/contract.entity.js');
  const { ContractSignature, LogEntry } = server('modules/contracts/contract-records.entity.js');
  const { logEntrySchema } = shared('schemas/contract.js');
  const { addDaysToKey, localDateKey, startOfLocalDay, timeZoneOffsetMs } = shared('dates.js');
  const bcrypt = require('bcryptjs');

  const ds = await openDatabase(dbFile);
  const postgres = ds.options.type === 'postgres';
  const db = postgres ? null : ds.driver.databaseConnection;
  const r = prng(10_000);
  const nowMs = Date.now();
  const today = localDateKey(nowMs, ZONE);
  const d = (n) => addDaysToKey(today, n);
  const day = 86_400_000;
  /** The local time `minutes` after midnight on the day `n` days from today, as the phone writes it (offset included). */
  const localAt = (n, minutes) => {
    const midnight = startOfLocalDay(d(n), ZONE);
    const guess = midnight + minutes * 60_000;
    const ms = guess + timeZoneOffsetMs(midnight, ZONE) - timeZoneOffsetMs(guess, ZONE);
    const offset = timeZoneOffsetMs(ms, ZONE);
    const abs = Math.abs(offset) / 60_000;
    const iso = `${new Date(ms + offset).toISOString().slice(0, 19)}${offset < 0 ? '-' : '+'}${String(Math.floor(abs / 60)).padStart(2, '0')}:${String(abs % 60).padStart(2, '0')}`;
    return { iso, ms };
  };
  const hash = bcrypt.hashSync(PASSWORD, 10);

  // ——— people ———
  const FIRST = ['Ada', 'Bram', 'Cleo', 'Dario', 'Edda', 'Finn', 'Greer', 'Hollis', 'Ines', 'Jory', 'Kit', 'Lena', 'Milo', 'Nell', 'Oren', 'Pia', 'Quin', 'Rhea', 'Sol', 'Tova'];
  const LAST = ['Ashdown', 'Brill', 'Corvell', 'Dunmore', 'Elsby', 'Farrow', 'Galt', 'Hensley', 'Iver', 'Jessop', 'Kettering', 'Lisle', 'Marren', 'Norwood', 'Orrin', 'Pell'];
  const person = (i, roles, extra = {}) => {
    const name = `${FIRST[i % FIRST.length]} ${LAST[Math.floor(i / FIRST.length) % LAST.length]}`;
    return Object.assign(new Account(), {
      id: crypto.randomUUID(),
      email: `season-${i}@bench.example`,
      passwordHash: hash,
      name,
      roles,
      activeRole: roles,
      businessName: roles === 'grower' ? `${LAST[i % LAST.length]} ${r.pick(['Orchards', 'Vineyards', 'Farms', 'Ranch'])}` : `${name.split(' ')[1]} ${r.pick(['Grazing', 'Range Sheep', 'Brush Goats', 'Flock Co.'])}`,
      phone: null,
      homePlace: null,
      homeLatitude: null,
      homeLongitude: null,
      flockSpecies: null,
      flockClass: null,
      flockHeadCount: null,
      flockBodyWeightLb: null,
      createdAt: new Date(nowMs - 400 * day),
      updatedAt: new Date(nowMs - 400 * day),
      ...extra,
    });
  };
  const growers = Array.from({ length: SEASON.growers }, (_, i) => person(i, 'grower'));
  const graziers = Array.from({ length: SEASON.graziers }, (_, i) =>
    person(SEASON.growers + i, 'grazier', {
      homePlace: 'Yards',
      homeLatitude: 34 + r.next() * 8,
      homeLongitude: -123.5 + r.next() * 7,
      flockSpecies: r.pick(['sheep', 'goats', 'mixed']),
      flockClass: r.pick(['dry ewes', 'wethers', 'ewes with lambs']),
      flockHeadCount: r.int(80, 2500),
      flockBodyWeightLb: r.int(90, 170),
    }),
  );
  // The two whose requests are measured: a grazier in the middle of the district with 600 dry ewes, and a grower.
  Object.assign(graziers[0], { email: 'grazier@bench.example', homeLatitude: 38, homeLongitude: -120, flockSpecies: 'sheep', flockClass: 'dry ewes', flockHeadCount: 600, flockBodyWeightLb: 150 });
  Object.assign(growers[0], { email: 'grower@bench.example' });
  const accounts = [...growers, ...graziers];

  // ——— the market: open blocks and their bids, drafts and withdrawn ones ———
  const blockBody = (i, start, windowEnd, outBy, sprayOn) => ({
    name: `${r.pick(['North', 'South', 'River', 'Upper', 'Lower', 'Bench', 'Creek'])} ${r.pick(['walnut', 'almond', 'vineyard', 'cover crop', 'fallow', 'prune'])} block ${i}`,
    crop: r.pick(['orchard', 'vineyard', 'row-crop cover', 'fallow', 'pasture']),
    acres: r.pick([5, 10, 20, 36, 40, 80, 120, 160, 300]) + r.int(0, 9) / 4,
    placeName: 'Invented district',
    latitude: Number((34 + r.next() * 8).toFixed(5)),
    longitude: Number((-123.5 + r.next() * 7).toFixed(5)),
    timeZone: ZONE,
    forageMethod: 'direct',
    lbDmPerAcre: r.int(600, 3500),
    targetUtilizationPct: r.pick([35, 40, 45, 50]),
    residualHeightIn: r.pick([null, 2, 3, 4]),
    windowStart: start,
    windowEnd,
    outBy,
    harvestDate: null,
    sprayRecords: sprayOn ? [{ product: 'Invented fungicide', appliedOn: sprayOn, grazingRestrictionDays: r.pick([0, 7, 14, 21]), containsCopper: r.chance(0.3) }] : [],
    waterOnSite: r.chance(0.6),
    perimeterFence: r.pick(['none', 'partial', 'full']),
    truckAccess: r.chance(0.8),
    speciesAllowed: r.pick([['sheep'], ['goats'], ['sheep', 'goats']]),
    youngPlantings: r.chance(0.2),
  });
  const blocks = [];
  const marketBlocks = SEASON.openBlocks + SEASON.otherBlocks;
  for (let i = 0; i < marketBlocks; i++) {
    const s = r.int(-20, 150);
    const windowEnd = d(s + r.int(14, 90));
    const outBy = d(s + r.int(10, 100));
    const record = await validBlockRecord(blockBody(i, d(s), windowEnd, outBy > d(s) ? outBy : windowEnd, r.chance(0.3) ? d(s - r.int(0, 30)) : null));
    const created = nowMs - r.int(1, 60 * 24 * 3600) * 1000;
    const status = i < SEASON.openBlocks ? 'open' : r.pick(['draft', 'withdrawn']);
    // The measured grower owns 25 open blocks; the others share the rest.
    const owner = i < 25 ? growers[0] : growers[1 + (i % (growers.length - 1))];
    blocks.push({ id: crypto.randomUUID(), ownerId: owner.id, status, ...record, publishedAt: status === 'draft' ? null : new Date(created), awardedAt: null, withdrawnAt: status === 'withdrawn' ? new Date(created + day) : null, createdAt: new Date(created), updatedAt: new Date(created) });
  }
  const open = blocks.filter((b) => b.status === 'open');
  const bids = [];
  const bidOn = (block, grazier, status) => {
    const created = block.createdAt.getTime() + r.int(1, 3600 * 48) * 1000;
    return {
      id: crypto.randomUUID(),
      blockId: block.id,
      grazierId: grazier.id,
      status,
      basis: r.pick(['head-day', 'acre', 'flat']),
      rate: r.pick(['0.18', '0.2', '0.25', '35', '1200']),
      headCount: r.int(100, 1500),
      species: block.speciesAllowed[0],
      animalClass: block.speciesAllowed[0] === 'sheep' ? 'dry ewes' : 'wethers',
      bodyWeightLb: r.int(100, 160),
      startDate: block.windowStart,
      endDate: block.windowEnd < block.outBy ? block.windowEnd : block.outBy,
      services: ['fencing'],
      note: null,
      decidedAt: null,
      createdAt: new Date(created),
      updatedAt: new Date(created),
    };
  };
  // The first open block of the measured grower carries 40 bids: the comparison a grower waits on.
  for (let k = 0; bids.length < SEASON.bids - SEASON.contracts; k++) {
    const block = open[k % open.length];
    const round = Math.floor(k / open.length);
    const n = k === 0 ? 40 : 1;
    for (let j = 0; j < n; j++) bids.push(bidOn(block, graziers[(k * 7 + round * 13 + j) % graziers.length], round === 0 || r.chance(0.6) ? 'live' : r.pick(['declined', 'withdrawn'])));
  }

  // ——— the contracts: awarded blocks, the winning bids, both signatures, the logs ———
  // Contract 0 is the measured one: the measured grower's block, the measured grazier's flock, in for 120 days
  // and still grazing. Contract 1 is the same pair's finished 120-day stay, signed off (its log PDF is stored).
  const contracts = [];
  const signatures = [];
  const entries = [];
  const finished = [];
  const CELLS = ['Cell 1', 'Cell 2', 'Cell 3', 'Cell 4', 'Cell 5', 'Cell 6'];
  const MORNING = ['Trough full; flock settled.', '', 'Reset two posts on the net after the wind.', 'Even take along the middles.', '', 'Dogs with the flock overnight.', 'Frost early; grazing by nine.', ''];
  for (let c = 0; c < SEASON.contracts; c++) {
    const measured = c < 2;
    const invoiced = c >= 2 && c < INVOICED_UNTIL;
    const grower = measured || (invoiced && c < MEASURED_GROWER_UNTIL) ? growers[0] : growers[1 + (c % (growers.length - 1))];
    const grazier = measured || c % 12 === 0 ? graziers[0] : graziers[1 + (c % (graziers.length - 1))];
    // Days from today: in, out (null while grazing), and the agreed end date.
    let inDay, outDay, endDay;
    if (c === 0) [inDay, outDay, endDay] = [-120, null, 10];
    else if (c === 1) [inDay, outDay, endDay] = [-150, -30, -30];
    else if (invoiced) {
      outDay = -r.int(8, 200);
      inDay = outDay - r.int(20, 80);
      endDay = outDay + r.pick([0, 0, 0, 1, 2, -1]);
    } else {
      inDay = -r.int(10, 90);
      outDay = null;
      endDay = r.int(3, 40);
    }
    const startDay = inDay;
    const outByDay = Math.max(endDay, outDay ?? endDay) + r.int(0, 5);
    const bidDay = startDay - r.int(10, 30);
    const awardDay = bidDay + r.int(1, 5);
    const record = await validBlockRecord(blockBody(SEASON.openBlocks + SEASON.otherBlocks + c, d(startDay - r.int(0, 10)), d(outByDay + r.int(1, 10)), d(outByDay), r.chance(0.3) ? d(startDay - 40) : null));
    const awardAt = localAt(awardDay, 12 * 60 + r.int(0, 300)).ms;
    const block = { id: crypto.randomUUID(), ownerId: grower.id, status: 'awarded', ...record, publishedAt: new Date(awardAt - 20 * day), awardedAt: new Date(awardAt), withdrawnAt: null, createdAt: new Date(awardAt - 21 * day), updatedAt: new Date(awardAt) };
    blocks.push(block);
    const species = block.speciesAllowed.length === 2 && r.chance(0.5) ? 'goats' : block.speciesAllowed[0];
    const head = measured ? 600 : r.int(120, 1500);
    const bidInput = {
      basis: r.pick(['head-day', 'head-day', 'head-day', 'acre', 'flat']),
      rate: '0',
      headCount: head,
      species,
      animalClass: species === 'sheep' ? r.pick(['dry ewes', 'wethers', 'ewes with lambs']) : r.pick(['wethers', 'does']),
      bodyWeightLb: species === 'sheep' ? r.int(120, 170) : r.int(90, 140),
      startDate: d(startDay),
      endDate: d(endDay),
      services: r.pick([['fencing'], ['fencing', 'herding'], ['fencing', 'guardian dogs'], ['fencing', 'water hauling']]),
    };
    bidInput.rate = bidInput.basis === 'head-day' ? r.pick(['0.16', '0.18', '0.2', '0.22']) : bidInput.basis === 'acre' ? r.pick(['18', '22.5', '30']) : r.pick(['1200', '2500', '4000']);
    const bidAt = localAt(bidDay, 9 * 60 + r.int(0, 600)).ms;
    const bid = { id: crypto.randomUUID(), blockId: block.id, grazierId: grazier.id, status: 'accepted', decidedAt: new Date(awardAt), ...(await validBidRecord(bidInput, block, d(bidDay))), createdAt: new Date(bidAt), updatedAt: new Date(awardAt) };
    bids.push(bid);

    const id = crypto.randomUUID();
    const terms = termsOfAward(id, block, grower, grazier, bid);
    const contract = { ...contractRecord(id, block, bid, terms), createdAt: new Date(awardAt), updatedAt: new Date(awardAt) };
    for (const [party, account, n] of [
      ['grower', grower, awardDay + r.int(0, 1)],
      ['grazier', grazier, awardDay + r.int(1, 3)],
    ]) {
      const input = { termsHash: contract.termsHash, typedName: account.name, cautionsAcknowledged: true };
      const origin = { ip: `198.51.100.${r.int(1, 254)}`, userAgent: 'Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) Mobile/15E148' };
      signatures.push(signatureRecord({ contractId: id, termsVersion: 1, party, accountId: account.id, input, termsHash: contract.termsHash, origin, at: new Date(localAt(Math.min(n, startDay - 1), 19 * 60 + r.int(0, 120)).ms) }));
    }
    contract.status = 'signed';

    // The log as a careful grazier keeps it: the move in (a second truckload the next day for some), a morning
    // check and most evenings a water check, a tally each week, now and then a loss, the grower's walk every
    // week or two, and the move out.
    const plan = [];
    const add = (by, n, minutes, entry) => plan.push({ by, n, minutes, entry });
    const split = !measured && r.chance(0.3) ? Math.round(head * 0.6) : head;
    let onBlock = 0;
    const lastDay = outDay ?? -1;
    const cellDays = r.int(2, 4);
    for (let n = inDay; n <= lastDay; n++) {
      const i = n - inDay;
      const cell = CELLS[Math.floor(i / cellDays) % CELLS.length];
      const take = ((i % cellDays) + 1) / cellDays;
      if (n === inDay) {
        add('grazier', n, 8 * 60 + r.int(0, 120), { kind: 'move', change: split, paddock: cell, waterChecked: true, fenceChecked: true, note: `Unloaded ${split} at the top gate.` });
        onBlock = split;
      } else {
        if (n === inDay + 1 && split < head) {
          add('grazier', n, 9 * 60 + r.int(0, 60), { kind: 'move', change: head - split, paddock: cell, note: 'Second truckload in.' });
          onBlock = head;
        }
        const fenceOk = r.chance(0.97);
        add('grazier', n, 6 * 60 + 30 + r.int(0, 120), {
          kind: 'observation',
          paddock: cell,
          residualHeightIn: Math.round((7 - 3.5 * take) * 10) / 10,
          takenPct: Math.round(10 + 35 * take),
          trampledPct: Math.round(4 + 8 * take),
          bareGroundPct: Math.round(1 + 3 * take),
          waterChecked: true,
          fenceChecked: fenceOk,
          note: fenceOk ? r.pick(MORNING) || null : 'Net down on the east side; reset it and walked the line.',
        });
        if (r.chance(0.8)) add('grazier', n, 17 * 60 + r.int(0, 150), { kind: 'observation', paddock: cell, waterChecked: true, fenceChecked: true, note: null });
        if (r.chance(0.012) && onBlock > 50) {
          const lost = r.int(1, 2);
          onBlock -= lost;
          add('grazier', n, 11 * 60 + r.int(0, 30), { kind: 'move', change: -lost, paddock: cell, note: `${lost === 1 ? 'One ewe' : 'Two ewes'} lost overnight; carcass removed off the block.` });
          add('grazier', n, 11 * 60 + 45, { kind: 'tally', count: onBlock, losses: lost, paddock: cell, note: 'Counted through the gate after the loss.' });
        } else if (i % 7 === 0) {
          // Now and then a count through a gate comes out one off: stored with the flag the server adds.
          add('grazier', n, 10 * 60 + r.int(0, 60), { kind: 'tally', count: r.chance(0.05) ? onBlock - 1 : onBlock, paddock: cell });
        }
        if (i % r.int(9, 12) === 0) add('grower', n, 15 * 60 + r.int(0, 90), { kind: 'observation', note: r.pick(['Walked the rows: even take.', 'Please keep clear of the replants by the well.', 'Good work along the berms.']), residualHeightIn: r.chance(0.5) ? Math.round((6 - 2 * take) * 10) / 10 : null });
      }
      if (n === outDay) add('grazier', n, 14 * 60 + r.int(0, 90), { kind: 'move', change: -onBlock, paddock: cell, note: 'Loaded out; gates shut, net rolled up.' });
    }
    plan.sort((a, b) => a.n - b.n || a.minutes - b.minutes);
    const moves = [];
    for (const [i, p] of plan.entries()) {
      const when = localAt(p.n, p.minutes);
      const input = await check(logEntrySchema, { clientId: `season-${c}-${i}`, at: when.iso, ...p.entry });
      const { atMs, flags } = vetLogEntry(input, { party: p.by, status: contract.status, latest: null, terms, nowMs, moves });
      const authorId = p.by === 'grower' ? grower.id : grazier.id;
      const row = logEntryRow(input, { contractId: id, party: p.by, authorId, atMs, flags, recordedAt: new Date(Math.min(nowMs, atMs + r.int(1, 40) * 60_000)) });
      entries.push(row);
      if (input.kind === 'move') moves.push({ id: row.id, at: input.at, atMs, change: input.change });
      if (contract.status === 'signed' && input.kind === 'move' && input.change > 0) Object.assign(contract, { status: 'grazing', grazingStartedAt: new Date(atMs) });
    }
    contracts.push(contract);
    if (outDay !== null) finished.push({ contract, grower, grazier, outDay, invoiced, paymentTermsDays: r.pick([0, 7, 14, 14, 30]), dispute: r.chance(0.1), pays: r.chance(0.65), payAfter: r.int(1, 40) });
  }
  // Live bids must be one per grazier per block (a unique index holds it): drop repeats the rounds made.
  const seen = new Set();
  const uniqueBids = bids.filter((b) => {
    if (b.status !== 'live') return true;
    const key = `${b.blockId}/${b.grazierId}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });

  const tables = [
    [Account, accounts],
    [Block, blocks],
    [Bid, uniqueBids],
    [Contract, contracts],
    [ContractSignature, signatures],
    [LogEntry, entries],
  ];
  if (postgres) {
    // Multi-row INSERTs through TypeORM (its own value conversion), 500 rows a statement, in one transaction.
    await ds.transaction(async (tx) => {
      for (const [entity, rows] of tables) {
        for (let i = 0; i < rows.length; i += 500) await tx.createQueryBuilder().insert().into(entity).values(rows.slice(i, i + 500)).updateEntity(false).execute();
      }
    });
    await ds.query('ANALYZE');
  } else {
    const inserts = tables.map(([entity, rows]) => [inserter(ds, db, entity), rows]);
    db.transaction(() => {
      for (const [insert, rows] of inserts) rows.forEach(insert);
    })();
  }

  // ——— finished stays through the services: sign-off, the invoice, the payment ———
  const invoicesMade = await finishStays(ds, dataDir, finished, { localAt, nowMs });
  if (postgres) await ds.query('ANALYZE');
  else db.pragma('wal_checkpoint(TRUNCATE)');
  const count = async (sql, params = []) => Number((await ds.query(sql.replace('?', postgres ? '$1' : '?'), params))[0].n);
  const counts = {
    openBlocks: await count(`SELECT COUNT(*) AS n FROM blocks WHERE status = 'open'`),
    bids: await count('SELECT COUNT(*) AS n FROM bids'),
    contracts: await count('SELECT COUNT(*) AS n FROM contracts'),
    signatures: await count('SELECT COUNT(*) AS n FROM contract_signatures'),
    logEntries: await count('SELECT COUNT(*) AS n FROM contract_log_entries'),
    invoices: await count('SELECT COUNT(*) AS n FROM invoices'),
    paid: await count(`SELECT COUNT(*) AS n FROM invoices WHERE status = 'paid'`),
    byStatus: Object.fromEntries((await ds.query('SELECT status, COUNT(*) AS n FROM contracts GROUP BY status')).map((x) => [x.status, Number(x.n)])),
    growerInvoices: await count('SELECT COUNT(*) AS n FROM invoices WHERE grower_id = ?', [growers[0].id]),
  };
  if (counts.logEntries < SEASON.logEntries) throw new Error(`bench seed: only ${counts.logEntries} log entries (want ${SEASON.logEntries})`);
  if (invoicesMade !== counts.invoices) throw new Error(`bench seed: ${invoicesMade} invoices made, ${counts.invoices} stored`);
  await ds.destroy();
  return { counts, grower: growers[0], grazier: graziers[0], bidBlock: open[0], measured: contracts[0], finishedMeasured: contracts[1] };
}

/**
 * The finished stays, in the order they happened: the grazier proposes the head-days after the move out, the
 * grower approves (one in ten disputes with a lower count, which the grazier accepts), the grazier invoices a
 * few days later and most growers pay. Each step is the service's own code on a clock set to its moment. The
 * payments API's part is what invoice-sync records from its answers (customer, invoice id, sent, paid), without
 * the round trips: the local payments fake keeps one district's worth of state and is not built for a season.
 * Mail the steps queue is marked sent (it went out long ago), so the server under test does not send it now.
 */
async function finishStays(ds, dataDir, finished, { localAt, nowMs }) {
  const { serviceContext } = server('app.js');
  const { inTransaction } = server('lib/db/transaction.js');
  const { signOff } = server('modules/contracts/sign-off.service.js');
  const { writeInvoice } = server('modules/invoices/invoices.service.js');
  const { ensureInvoicePdf, markPaid, markSent } = server('modules/invoices/invoice-sync.js');
  const { Invoice, PaymentCustomer } = server('modules/invoices/invoice.entity.js');
  const { Account } = server('modules/accounts/account.entity.js');
  const clock = { now: nowMs };
  const ctx = serviceContext({
    dataSource: ds,
    tokens: { secret: 'bench-season-seed-secret-long-enough', ttl: '1h' },
    uploadsDir: path.join(dataDir, 'uploads'),
    documentsDir: path.join(dataDir, 'documents'),
    outbox: { kick() {} },
    now: () => clock.now,
    log: (m) => console.error(`[bench seed] ${m}`),
    payments: null,
  });
  const accounts = new Map();
  const account = async (id) => accounts.get(id) ?? accounts.set(id, await ds.getRepository(Account).findOneByOrFail({ id })).get(id);
  const at = (n, minutes) => Math.min(nowMs, localAt(n, minutes).ms);
  const apiId = (prefix) => `${prefix}_bench${crypto.randomBytes(9).toString('hex')}`;
  let invoices = 0;
  let apiNumber = 1000;
  const steps = [];
  for (const f of finished) {
    const id = f.contract.id;
    steps.push({
      t: at(f.outDay, 17 * 60),
      run: async () => {
        f.proposed = (await signOff(ctx, await account(f.grazier.id), id, { action: 'propose', comment: 'Out on schedule.' })).signOff.proposedHeadDays;
      },
    });
    if (f.dispute) {
      // The grower counts the last morning out (the sprayer went through): about 2 % less, to the tenth of a head-day.
      steps.push({ t: at(f.outDay + 1, 9 * 60), run: async () => signOff(ctx, await account(f.grower.id), id, { action: 'dispute', headDays: Math.floor(f.proposed * 0.98 * 10) / 10, comment: 'The flock was off rows 8–12 the last morning while the sprayer went through.' }) });
      steps.push({ t: at(f.outDay + 1, 16 * 60), run: async () => signOff(ctx, await account(f.grazier.id), id, { action: 'accept-counter' }) });
    } else steps.push({ t: at(f.outDay + 1, 9 * 60), run: async () => signOff(ctx, await account(f.grower.id), id, { action: 'approve' }) });
    if (!f.invoiced) continue;
    const issueDay = f.outDay + 2 + (id.charCodeAt(0) % 4);
    steps.push({
      t: at(issueDay, 18 * 60),
      run: async () => {
        const grazier = await account(f.grazier.id);
        const invoiceId = await inTransaction(ds, (tx) => writeInvoice(tx, ctx, grazier, id, f.paymentTermsDays));
        invoices += 1;
        f.invoiceId = invoiceId;
        const inv = await ds.getRepository(Invoice).findOneByOrFail({ id: invoiceId });
        f.provider = { id: apiId('in'), customerId: '', number: `BENCH-${apiNumber++}`, status: 'open', totalCents: inv.totalCents, amountDueCents: inv.totalCents, amountPaidCents: 0, paidAt: null, fieldfoldInvoiceId: inv.id };
        await inTransaction(ds, async (tx) => {
          await tx.createQueryBuilder().insert().into(PaymentCustomer).values({ accountId: inv.growerId, providerCustomerId: apiId('cus'), createdAt: clock.now }).orIgnore().execute();
          f.provider.customerId = (await tx.findOneByOrFail(PaymentCustomer, { accountId: inv.growerId })).providerCustomerId;
          await tx.update(Invoice, { id: inv.id }, { providerCustomerId: f.provider.customerId, providerInvoiceId: f.provider.id, providerStatus: 'draft', updatedAt: clock.now });
          await markSent(tx, ctx, inv.id, f.provider);
        });
        await ensureInvoicePdf(ctx, inv.id);
      },
    });
    if (f.pays && issueDay + f.payAfter < 0) {
      steps.push({
        t: at(issueDay + f.payAfter, 20 * 60),
        run: async () => {
          const paid = { ...f.provider, status: 'paid', amountDueCents: 0, amountPaidCents: f.provider.totalCents, paidAt: clock.now };
          await inTransaction(ds, async (tx) => {
            await tx.update(Invoice, { id: f.invoiceId }, { payAttempts: 1, updatedAt: clock.now });
            await markPaid(tx, ctx, f.invoiceId, { paidAt: clock.now, paidWith: 'pm_card_visa', provider: paid });
          });
          await ensureInvoicePdf(ctx, f.invoiceId);
        },
      });
    }
  }
  steps.sort((a, b) => a.t - b.t);
  for (const s of steps) {
    clock.now = s.t;
    await s.run();
  }
  await ds.query(`UPDATE mail_outbox SET status = 'sent', sent_at = created_at WHERE status = 'pending'`);
  return invoices;
}
