import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { startMailSink, type MailSink } from '../../server/fakes/mail-sink';
import type { SinkMessage } from '../../server/fakes/mail-sink/message';
import { composeMail } from '../../server/lib/mail/compose';
import { appLinks } from '../../server/lib/mail/links';
import { SmtpMail } from '../../server/lib/mail/smtp-mail';
import { openDatabase } from '../../server/db/data-source';
import { inTransaction } from '../../server/lib/db/transaction';
import { OUTBOX_BACKOFF_MS, OutboxSender, pendingMail, queueMail } from '../../server/lib/mail/outbox';
import { freshTestDatabase } from '../helpers/test-database';

// Real mail end to end on loopback: the nodemailer adapter speaks SMTP to the sink (smtp-server on port 0),
// and the tests read what arrived through the sink's JSON API and inbox page, as a developer would.

const FROM = { name: 'Fieldfold', address: 'no-reply@fieldfold.localhost' };

let sink: MailSink;
let dataDir: string;
let ui: () => ReturnType<typeof request>;
let mail: SmtpMail;

beforeEach(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-mail-sink-'));
  sink = await startMailSink({ smtpPort: 0, uiPort: 0, host: '127.0.0.1', dataDir });
  ui = () => request(`http://127.0.0.1:${sink.uiPort}`);
  mail = new SmtpMail({ host: '127.0.0.1', port: sink.smtpPort, from: FROM, connectTimeoutMs: 1000 });
});
afterEach(async () => {
  await sink.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

async function messages(query = ''): Promise<{ total: number; count: number; start: number; items: SinkMessage[] }> {
  const res = await ui().get(`/api/v2/messages${query}`);
  expect(res.status).toBe(200);
  return res.body;
}

const links = appLinks('http://localhost:8080');
const bidMail = () =>
  composeMail({
    to: 'greta@calder.example',
    subject: 'New bid on North bench <walnut> middles',
    greeting: 'Hello Greta,',
    paragraphs: ['Kellner Range Sheep bid on North bench <walnut> middles: 600 sheep, 18 days.'],
    facts: [['Services', 'fencing, guardian dogs']],
    action: { label: 'Compare the bids', url: links.block('b-42') },
  });

describe('the SMTP adapter and the mail sink', () => {
  it('When the adapter sends a composed message, then GET /api/v2/messages has it in the catchers\' shape with its text and HTML parts', async () => {
    const composed = bidMail();
    await mail.send({ ...composed, id: 'outbox-row-7f3a' });

    const list = await messages();
    expect(list).toMatchObject({ total: 1, count: 1, start: 0 });
    const m = list.items[0];
    expect(m.ID).toEqual(expect.any(String));
    expect(m.From).toEqual({ Relays: null, Mailbox: 'no-reply', Domain: 'fieldfold.localhost', Params: expect.any(String) });
    expect(m.To).toEqual([{ Relays: null, Mailbox: 'greta', Domain: 'calder.example', Params: '' }]);
    expect(m.Raw).toMatchObject({ From: 'no-reply@fieldfold.localhost', To: ['greta@calder.example'] });
    expect(Number.isNaN(Date.parse(m.Created))).toBe(false);

    // Headers: name → values, as nodemailer built them.
    const h = m.Content.Headers;
    expect(h.From).toEqual(['Fieldfold <no-reply@fieldfold.localhost>']);
    expect(h.To).toEqual(['greta@calder.example']);
    // The outbox row id is the Message-ID, the same on every attempt.
    expect(h['Message-ID']).toEqual(['<outbox-row-7f3a@fieldfold.localhost>']);
    expect(m.Parsed.MessageID).toBe('<outbox-row-7f3a@fieldfold.localhost>');
    expect(h.Subject).toEqual(['New bid on North bench <walnut> middles']);
    expect(h['Content-Type'][0]).toMatch(/^multipart\/alternative; boundary=/);
    expect(m.Content.Size).toBe(Buffer.byteLength(m.Raw.Data));
    expect(m.Raw.Data.endsWith(m.Content.Body)).toBe(true);

    // Both parts arrive as composed: the text verbatim, the HTML with the name escaped and the app link.
    expect(m.Parsed.Subject).toBe(composed.subject);
    expect(m.Parsed.Text?.trim()).toBe(composed.text.trim());
    expect(m.Parsed.HTML).toContain('North bench &lt;walnut&gt; middles');
    expect(m.Parsed.HTML).toContain('href="http://localhost:8080/blocks/b-42"');
    expect(m.Parsed.To).toEqual(['greta@calder.example']);

    const one = await ui().get(`/api/v1/messages/${m.ID}`);
    expect(one.status).toBe(200);
    expect(one.body.ID).toBe(m.ID);
    expect((await ui().get('/api/v1/messages/no-such-id')).status).toBe(404);
  });

  it('When a subject carries CR LF and a Bcc line, then the library folds it into the one Subject header and no Bcc header or recipient appears', async () => {
    await mail.send({ to: 'greta@calder.example', subject: 'Block changed: North\r\nBcc: thief@elsewhere.example\r\n\r\nInjected body', text: 'Hello.' });
    const [m] = (await messages()).items;
    const names = Object.keys(m.Content.Headers).map((n) => n.toLowerCase());
    expect(names).not.toContain('bcc');
    expect(m.Content.Headers.Subject).toHaveLength(1);
    expect(m.Content.Headers.Subject[0]).toMatch(/^Block changed: North +Bcc: thief@elsewhere\.example +Injected body$/);
    expect(m.Raw.To).toEqual(['greta@calder.example']);
    expect(m.Parsed.Text?.trim()).toBe('Hello.');
  });

  it('When a recipient is not one plain address or the id is not an atom, then the adapter refuses it before any SMTP', async () => {
    await expect(mail.send({ to: 'greta@calder.example\r\nBcc: thief@elsewhere.example', subject: 'x', text: 'x' })).rejects.toThrow('Mail to must be one plain address');
    await expect(mail.send({ to: 'greta@calder.example, thief@elsewhere.example', subject: 'x', text: 'x' })).rejects.toThrow('Mail to must be one plain address');
    await expect(mail.send({ to: 'Greta <greta@calder.example>', subject: 'x', text: 'x' })).rejects.toThrow('Mail to must be one plain address');
    await expect(mail.send({ id: 'x>\r\nBcc: thief@elsewhere.example', to: 'greta@calder.example', subject: 'x', text: 'x' })).rejects.toThrow('Mail id must be');
    expect((await messages()).total).toBe(0);
  });

  it('When several messages arrive, then the list is newest first and start/limit page through it; bad paging is a 400 naming the parameter', async () => {
    for (const n of [1, 2, 3]) await mail.send({ to: 'wade@calder.example', subject: `Message ${n}`, text: `Number ${n}` });
    expect((await messages()).items.map((m) => m.Parsed.Subject)).toEqual(['Message 3', 'Message 2', 'Message 1']);
    const page = await messages('?start=1&limit=1');
    expect(page).toMatchObject({ total: 3, count: 1, start: 1 });
    expect(page.items[0].Parsed.Subject).toBe('Message 2');
    expect((await messages('?start=5')).count).toBe(0);
    const bad = await ui().get('/api/v2/messages?limit=-1&start=x');
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['limit', 'start']);
  });

  it('When DELETE /api/v1/messages is called, then the inbox is empty', async () => {
    await mail.send({ to: 'wade@calder.example', subject: 'To be deleted', text: 'x' });
    expect((await messages()).total).toBe(1);
    expect((await ui().delete('/api/v1/messages')).status).toBe(200);
    expect(await messages()).toEqual({ total: 0, count: 0, start: 0, items: [] });
  });

  it('When the inbox page\'s own form posts /clear, then the inbox is emptied; a post from another site is refused', async () => {
    await mail.send({ to: 'wade@calder.example', subject: 'To be cleared', text: 'x' });
    const host = `127.0.0.1:${sink.uiPort}`;
    expect((await ui().post('/clear').set('Origin', 'https://elsewhere.example')).status).toBe(403);
    expect((await ui().post('/clear').set('Origin', 'null')).status).toBe(403);
    expect((await messages()).total).toBe(1);
    const ok = await ui().post('/clear').set('Origin', `http://${host}`);
    expect(ok.status).toBe(303);
    expect(ok.headers.location).toBe('/');
    expect((await messages()).total).toBe(0);
  });

  it('When the inbox page is opened, then it lists the message and shows it with the HTML part sandboxed and every value escaped', async () => {
    await mail.send(bidMail());
    await mail.send({ to: 'greta@calder.example', subject: '<script>alert(1)</script>', text: 'Plain only <b>not bold</b>' });
    const [plain, composed] = (await messages()).items;

    const inbox = await ui().get('/');
    expect(inbox.status).toBe(200);
    expect(inbox.headers['content-security-policy']).toContain("default-src 'none'");
    expect(inbox.text).toContain('New bid on North bench &lt;walnut&gt; middles');
    expect(inbox.text).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
    expect(inbox.text).not.toContain('<script>');
    expect(inbox.text).toContain(`href="/messages/${composed.ID}"`);

    const open = await ui().get(`/messages/${composed.ID}`);
    expect(open.status).toBe(200);
    const iframe = open.text.match(/<iframe[^>]*>/)?.[0] ?? '';
    expect(iframe).toMatch(/sandbox="allow-popups allow-popups-to-escape-sandbox"/);
    expect(iframe).not.toMatch(/allow-scripts|allow-same-origin/);
    // The HTML part lives only inside srcdoc, attribute-escaped.
    expect(iframe).toContain('srcdoc="&lt;!doctype html&gt;');
    expect(open.text).toContain('<pre>Hello Greta,');

    const plainPage = await ui().get(`/messages/${plain.ID}`);
    expect(plainPage.text).not.toContain('<iframe');
    expect(plainPage.text).toContain('Plain only &lt;b&gt;not bold&lt;/b&gt;');
    expect((await ui().get('/messages/nope')).status).toBe(404);
  });

  it('When more messages arrive than the sink keeps, then the oldest go first', async () => {
    await sink.close();
    sink = await startMailSink({ smtpPort: 0, uiPort: 0, host: '127.0.0.1', maxMessages: 2 });
    mail = new SmtpMail({ host: '127.0.0.1', port: sink.smtpPort, from: FROM });
    for (const n of [1, 2, 3]) await mail.send({ to: 'wade@calder.example', subject: `Message ${n}`, text: 'x' });
    const list = await messages();
    expect(list.total).toBe(2);
    expect(list.items.map((m) => m.Parsed.Subject)).toEqual(['Message 3', 'Message 2']);
  });

  it('When the sink restarts on the same data folder, then the inbox is still there', async () => {
    await mail.send({ to: 'greta@calder.example', subject: 'Kept across a restart', text: 'x' });
    await sink.close();
    sink = await startMailSink({ smtpPort: 0, uiPort: 0, host: '127.0.0.1', dataDir });
    expect((await messages()).items.map((m) => m.Parsed.Subject)).toEqual(['Kept across a restart']);
  });

  it('When the sink is closed, then the adapter rejects (so the outbox can retry) instead of losing the message quietly', async () => {
    await sink.close();
    await expect(mail.send({ to: 'greta@calder.example', subject: 'Nobody listening', text: 'x' })).rejects.toThrow(/ECONNREFUSED|connect/i);
  });

  it('When a server accepts the connection but never greets, then the adapter gives up after its short greeting timeout', async () => {
    const sockets: net.Socket[] = [];
    const silent = net.createServer((socket) => void sockets.push(socket));
    await new Promise<void>((r) => silent.listen(0, '127.0.0.1', () => r()));
    const { port } = silent.address() as net.AddressInfo;
    const slow = new SmtpMail({ host: '127.0.0.1', port, from: FROM, connectTimeoutMs: 300 });
    const began = Date.now();
    try {
      await expect(slow.send({ to: 'greta@calder.example', subject: 'Silent server', text: 'x' })).rejects.toThrow(/greeting/i);
      expect(Date.now() - began).toBeLessThan(3000);
    } finally {
      for (const s of sockets) s.destroy();
      await new Promise<void>((r) => silent.close(() => r()));
    }
  });

  it('When the sink is down, then the outbox keeps the message and delivers it through the adapter once the sink is back', async () => {
    const database = await freshTestDatabase();
    const ds = await openDatabase(database.target);
    const clock = { now: Date.parse('2026-12-01T20:00:00Z') };
    const logged: string[] = [];
    const outbox = new OutboxSender(ds, mail, () => clock.now, (l) => logged.push(l));
    try {
      await inTransaction(ds, (tx) => queueMail(tx, [bidMail()], clock.now));
      const port = sink.smtpPort;
      await sink.close();
      expect(await outbox.drain()).toBe(0);
      expect(await pendingMail(ds)).toBe(1);
      expect(logged.join('\n')).toMatch(/"New bid on North bench <walnut> middles" not sent \(attempt 1\)/);

      sink = await startMailSink({ smtpPort: port, uiPort: 0, host: '127.0.0.1', dataDir });
      clock.now += OUTBOX_BACKOFF_MS[0];
      expect(await outbox.drain()).toBe(1);
      expect(await pendingMail(ds)).toBe(0);
      const [m] = (await messages()).items;
      expect(m.Parsed.Subject).toBe('New bid on North bench <walnut> middles');
      expect(m.Content.Headers['Message-ID'][0]).toMatch(/^<[0-9a-f-]{36}@fieldfold\.localhost>$/);
    } finally {
      await outbox.stop();
      await ds.destroy();
      await database.drop();
    }
  });
});
