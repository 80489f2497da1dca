import crypto from 'node:crypto';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pdfkitRenderer } from '../../server/lib/pdf/pdfkit-renderer';
import { grazingLogData, invoiceData, termsSha256 } from '../helpers/pdf-scenario';

// The PDF records read back with Debian's poppler-utils (pdftotext, pdffonts, pdfinfo), as a person's PDF
// viewer would read them. Expected figures are worked by hand from the invented scenario in
// __tests__/helpers/pdf-scenario.ts, not taken from the code under test.

const renderer = pdfkitRenderer();
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-pdf-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let n = 0;
function saved(bytes: Buffer): string {
  n += 1;
  const file = path.join(dir, `doc-${n}.pdf`);
  fs.writeFileSync(file, bytes);
  return file;
}

/** Text of the file (or of one page), whitespace collapsed so wrapped lines still match. */
function pdfText(file: string, page?: number): string {
  const args = page ? ['-f', String(page), '-l', String(page)] : [];
  return execFileSync('/usr/bin/pdftotext', [...args, '-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

function pageCount(file: string): number {
  const info = execFileSync('/usr/bin/pdfinfo', [file], { encoding: 'utf8' });
  return Number(/Pages:\s+(\d+)/.exec(info)![1]);
}

function fontsOf(file: string): Array<{ name: string; embedded: string }> {
  const lines = execFileSync('/usr/bin/pdffonts', [file], { encoding: 'utf8' }).trim().split('\n').slice(2);
  return lines.map((l) => {
    const cols = l.trim().split(/\s+/);
    // name, type (two words: "CID TrueType"), encoding, emb, sub, uni, object, ID
    return { name: cols[0], embedded: cols[cols.length - 5] };
  });
}

const sha256 = (b: Buffer) => crypto.createHash('sha256').update(b).digest('hex');

describe('grazing log PDF', () => {
  let file: string;
  let text: string;
  beforeAll(async () => {
    file = saved(await renderer.renderGrazingLog(grazingLogData()));
    text = pdfText(file);
  });

  it('When the log is printed, then the title block names Fieldfold, the kind, the contract, the version and when it was made', () => {
    expect(text).toContain('Fieldfold');
    expect(text).toContain('GRAZING LOG');
    expect(text).toContain('7c1e2f4a-5b6d-4e8f-9a0b-c1d2e3f4a5b6');
    expect(text).toMatch(/CONTRACT VERSION GENERATED 7c1e2f4a-5b6d-4e8f-9a0b-c1d2e3f4a5b6 2 Mar 3, 2027, 9:15 AM PST/);
  });

  it('When the log is printed, then the terms summary shows parties, block, forage, price, head, dates and restrictions', () => {
    for (const s of [
      'Greta Olsen, Olsen Walnut Orchard',
      'Wade Kellner, Kellner Range Sheep',
      'North bench walnut middles',
      '120 ac',
      '2,000 lb DM/ac',
      '45 % of standing forage',
      '$0.18 per head-day',
      '600 dry ewes (sheep), about 150 lb each',
      'Jan 10 – Feb 26, 2027 — 47 days,',
      '28,200 head-days planned',
      'Mar 1, 2027',
      'fencing, guardian dogs',
      'No grazing before Dec 31, 2026',
      'walnut replants in rows 40–44',
    ]) {
      expect(text).toContain(s);
    }
  });

  it('When the log is printed, then the totals are the hand-worked head-days, AUD and AUM with the convention named', () => {
    // 600 head from Jan 10 08:00 to Feb 27 16:00 (48 d 8 h = 48.333… d) = 29 000 head-days, then 120 head to
    // Mar 2 10:00 (2 d 18 h = 2.75 d) = 330: 29 330. Intake 150 lb × 2.5 % = 3.75 lb DM/head/day (NCAT ATTRA,
    // "Grazier's Math", dry ewes); AUD = 29 330 × 3.75 ÷ 26 = 4 230.29 (SRM Glossary 1998: 26 lb DM per AU-day),
    // AUM = 4 230.29 ÷ 30 = 141.01.
    expect(text).toMatch(/HEAD-DAYS FROM THE LOG .*29,330 head-days/);
    expect(text).toContain('4,230.3 AUD');
    expect(text).toContain('141.01 AUM');
    expect(text).toContain('AUD at 26 lb DM per animal unit per day; AUM = AUD ÷ 30');
    expect(text).toMatch(/Total 0 29,330 head-days from the moves in this log/);
  });

  it('When the log is printed, then both signatures, their times, the IP and the SHA-256 terms hash are on it', () => {
    expect(text).toContain('Greta M. Olsen');
    expect(text).toContain('Signed Jan 5, 2027, 9:12 AM PST');
    expect(text).toContain('from 203.0.113.24');
    expect(text).toContain('Signed Jan 5, 2027, 2:40 PM PST');
    expect(text).toContain('TERMS HASH (SHA-256)');
    expect(text).toContain(termsSha256());
  });

  it('When head-days are agreed, then the record names who proposed and who approved them, and when', () => {
    expect(text).toContain('Head-days agreed at sign-off: 29,330');
    expect(text).toContain('Proposed by Wade Kellner, Mar 2, 2027, 12:00 PM PST');
    expect(text).toContain('approved by Greta Olsen, Mar 3, 2027, 9:05 AM PST');
  });

  it('When entries fall after the out-by date or a tally disagrees, then they are listed and marked Flagged in the table', () => {
    expect(text).toContain('Flagged entries (6)');
    expect(text).toContain('Jan 27, 2027, 07:15 — Tally of 597 differs from the 600 head the moves put on the block');
    expect(text).toContain('Flagged: After the animals-out-by date (Mar 1, 2027)');
    expect(text).toContain('Flagged: Animals on the block after the out-by date (Mar 1, 2027)');
    expect(text).toMatch(/Mar 2, 2027 0 50 08:40 Observation/);
  });

  it('When the log is printed, then the cautions defer to the label, local rules and licensed advice', () => {
    expect(text).toContain('Danger: No grazing before Dec 31, 2026');
    expect(text).toContain('Danger: Copper sprays: a risk for sheep');
    expect(text).toContain('Food safety before harvest');
    expect(text).toContain('Electric fence, people and predators');
    expect(text).toContain('Water and heat');
    expect(text).toContain('do not replace the pesticide label (which is the law), local rules, your veterinarian, or licensed pest-control and food-safety advice');
  });

  it('When the table runs over several pages, then each of them repeats its header and every page is numbered "page N of M"', () => {
    const pages = pageCount(file);
    expect(pages).toBeGreaterThan(3);
    let tablePages = 0;
    for (let p = 1; p <= pages; p++) {
      const page = pdfText(file, p);
      expect(page).toContain(`page ${p} of ${pages}`);
      if (/\d\d:\d\d (Observation|Moved|Counted)/.test(page)) {
        tablePages += 1;
        expect(page).toMatch(/Head on Water Fence Date block Head-days Time Entry and notes Residual Taken checked checked/);
      }
    }
    expect(tablePages).toBeGreaterThan(1);
  });

  it('When no block cautions are given, then the general grazing cautions are printed', async () => {
    const t = pdfText(saved(await renderer.renderGrazingLog(grazingLogData({ cautions: [] }))));
    expect(t).toContain('Pesticide labels set when animals may graze');
    expect(t).toContain('Copper sprays and sheep');
    expect(t).toContain('Out well before harvest');
  });

  it('When nothing is signed or agreed yet, then the record says so instead of printing blanks', async () => {
    const t = pdfText(saved(await renderer.renderGrazingLog(grazingLogData({ signatures: [], termsSha256: null, agreed: null }))));
    expect(t).toContain('Not signed yet');
    expect(t).toContain('Head-days not agreed yet');
  });

  it('When the generated-at time has no offset, then it refuses rather than guess the date', async () => {
    await expect(renderer.renderGrazingLog(grazingLogData({ generatedAt: '2027-03-03 09:15' }))).rejects.toThrow(/not a valid instant/);
  });

  it('When the days do not add up to the total, then it refuses to print', async () => {
    const data = grazingLogData();
    await expect(renderer.renderGrazingLog({ ...data, log: { ...data.log, headDays: data.log.headDays + 1 } })).rejects.toThrow(/add up/);
  });

  it("When the log is printed, then every font in it is Fieldfold's own, embedded, and no standard font is named", () => {
    expect(fs.readFileSync(file).includes('Helvetica')).toBe(false);
    const fonts = fontsOf(file);
    expect(fonts.length).toBeGreaterThanOrEqual(4);
    for (const f of fonts) {
      expect(f.name).toMatch(/^[A-Z]{6}\+(PublicSans-(Regular|SemiBold|Bold)|Bitter-(SemiBold|Bold))$/);
      expect(f.embedded).toBe('yes');
    }
  });
});

describe('invoice PDF', () => {
  it('When an invoice is printed, then it shows both parties, number, dates, reference, every line and the total in dollars', async () => {
    const file = saved(await renderer.renderInvoice(invoiceData()));
    const t = pdfText(file);
    expect(t).toContain('Invoice FF-2027-0007');
    expect(t).toContain('Kellner Range Sheep');
    expect(t).toContain('Olsen Walnut Orchard');
    expect(t).toMatch(/ISSUED .*DUE .*Mar 3, 2027 .*Apr 2, 2027/);
    expect(t).toContain('Contract 7c1e2f4a-5b6d-4e8f-9a0b-c1d2e3f4a5b6 · block North bench walnut middles');
    // 29 330 head-days × $0.18 = $5 279.40; plus $420.00 of hauled water = $5 699.40.
    expect(t).toMatch(/Grazing \(head-days\) 29,330 head-days \$0\.18 \$5,279\.40/);
    expect(t).toMatch(/Water hauling, 6 loads 1 fee \$420\.00 \$420\.00/);
    expect(t).toContain('Grazing subtotal $5,279.40');
    expect(t).toContain('Fees $420.00');
    expect(t).toContain('Total due $5,699.40');
    expect(t).toContain('SENT · DUE APR 2, 2027');
    expect(t).toContain('Due within 30 days of issue');
    expect(t).toContain('page 1 of 1');
    for (const f of fontsOf(file)) expect(f.name).toMatch(/^[A-Z]{6}\+(PublicSans|Bitter)-/);
  });

  it('When the invoice is paid, then it says so with the paid date', async () => {
    const t = pdfText(saved(await renderer.renderInvoice(invoiceData({ status: 'paid', paidAt: '2027-03-20T11:42:00-07:00' }))));
    expect(t).toContain('PAID Mar 20, 2027, 11:42 AM PDT');
    expect(t).toContain('Total (paid) $5,699.40');
    expect(t).not.toContain('SENT');
  });

  it('When the lines do not add up to the totals, then it refuses to print', async () => {
    await expect(renderer.renderInvoice(invoiceData({ totalCents: 569941 }))).rejects.toThrow(/add up/);
    await expect(renderer.renderInvoice(invoiceData({ subtotalCents: 1 }))).rejects.toThrow(/subtotal/);
    await expect(renderer.renderInvoice(invoiceData({ status: 'paid', paidAt: null }))).rejects.toThrow(/paid/);
  });
});

describe('deterministic bytes', () => {
  it('When the same data is rendered twice, then the files and their SHA-256 are identical; a new version differs', async () => {
    const a = await renderer.renderGrazingLog(grazingLogData());
    const b = await pdfkitRenderer().renderGrazingLog(grazingLogData());
    expect(sha256(a)).toBe(sha256(b));
    expect(a.equals(b)).toBe(true);
    const c = await renderer.renderGrazingLog(grazingLogData({ version: 3 }));
    expect(sha256(c)).not.toBe(sha256(a));
    const i1 = await renderer.renderInvoice(invoiceData());
    const i2 = await renderer.renderInvoice(invoiceData());
    expect(sha256(i1)).toBe(sha256(i2));
  });

  it('When the file is made, then its creation date is the data\'s, not the clock\'s', async () => {
    const bytes = await renderer.renderInvoice(invoiceData());
    const info = execFileSync('/usr/bin/pdfinfo', ['-isodates', saved(bytes)], { encoding: 'utf8' });
    expect(info).toMatch(/CreationDate:\s+2027-03-03T18:00:00Z/);
    expect(info).toMatch(/Creator:\s+Fieldfold/);
  });
});

describe('speed', () => {
  it('When a 120-day log with four entries a day is rendered, then it prints the time taken (the bench judges it)', async () => {
    // 600 head from Jan 10 08:00 to May 6 16:00 (116 d 8 h) = 69 800 head-days, 120 head to May 9 10:00
    // (2.75 d) = 330: 70 130.
    const data = grazingLogData({}, { days: 120, perDay: 4, endDate: '2027-05-09', outBy: '2027-05-15' });
    const entries = data.log.days.reduce((k, d) => k + d.entries.length, 0);
    const times: number[] = [];
    const cpu: number[] = [];
    let bytes: Buffer = Buffer.alloc(0);
    for (let i = 0; i < 7; i++) {
      const c = process.cpuUsage();
      const t = performance.now();
      bytes = await renderer.renderGrazingLog(data);
      times.push(performance.now() - t);
      const used = process.cpuUsage(c);
      cpu.push((used.user + used.system) / 1000);
    }
    const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];
    // CPU time is printed beside wall time because the machine running the suite is often shared.
    console.log(
      `grazing log PDF, ${data.log.days.length} days, ${entries} entries, ${bytes.length} bytes: first ${times[0].toFixed(1)} ms ` +
        `(fonts parsed once per process), then median ${median(times.slice(1)).toFixed(1)} ms wall, ${median(cpu.slice(1)).toFixed(1)} ms CPU`,
    );
    const file = saved(bytes);
    expect(pageCount(file)).toBeGreaterThan(10);
    expect(pdfText(file)).toMatch(/Total 0 70,130 head-days from the moves in this log/);
  });
});
