import crypto from 'node:crypto';
import type { AddressObject, ParsedMail } from 'mailparser';
import type { SMTPServerAddress } from 'smtp-server';

// A received message in the JSON shape development mail catchers serve at /api/v2/messages, so the clients
// and habits people already have work against it: From/To are the SMTP envelope (MAIL FROM, RCPT TO) as
// { Relays, Mailbox, Domain, Params }; Content.Headers maps each header name, as the message spells it, to
// its values, unfolded but not decoded (an encoded subject stays =?UTF-8?Q?…?=, as on the wire); Content.Body
// is the body as sent (MIME parts and transfer encodings included); Raw.Data is the whole message.
// `Parsed` is Fieldfold's addition: what mailparser decoded (subject, text part, HTML part), so a test or the
// inbox page reads the parts without a MIME decoder of its own.

export interface EnvelopeAddress {
  Relays: string[] | null;
  Mailbox: string;
  Domain: string;
  /** SMTP parameters of the command, "BODY=8BITMIME SIZE=1234"; empty when there were none. */
  Params: string;
}

export interface SinkMessage {
  ID: string;
  From: EnvelopeAddress;
  To: EnvelopeAddress[];
  Content: { Headers: Record<string, string[]>; Body: string; Size: number; MIME: null };
  /** ISO 8601 instant the sink accepted the message. */
  Created: string;
  /** Catchers put decoded MIME parts here; this sink leaves it null and decodes into `Parsed` instead. */
  MIME: null;
  Raw: { From: string; To: string[]; Data: string; Helo: string };
  Parsed: {
    Subject: string;
    /** The From header as text ("Fieldfold <no-reply@fieldfold.localhost>"). */
    From: string;
    /** Addresses of the To header (groups flattened). */
    To: string[];
    Date: string | null;
    MessageID: string | null;
    Text: string | null;
    HTML: string | null;
  };
}

export interface Envelope {
  mailFrom: SMTPServerAddress | false;
  rcptTo: SMTPServerAddress[];
  helo: string;
}

function envelopeAddress(a: SMTPServerAddress | false): EnvelopeAddress {
  const address = a ? a.address : '';
  const at = address.lastIndexOf('@');
  const params = a && a.args ? Object.entries(a.args).map(([k, v]) => (v === true ? k : `${k}=${String(v)}`)).join(' ') : '';
  return { Relays: null, Mailbox: at < 0 ? address : address.slice(0, at), Domain: at < 0 ? '' : address.slice(at + 1), Params: params };
}

function headersOf(parsed: ParsedMail): Record<string, string[]> {
  const headers: Record<string, string[]> = {};
  for (const { line } of parsed.headerLines) {
    const colon = line.indexOf(':');
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim();
    // Unfold (RFC 5322 §2.2.3): a line break followed by white space continues the header.
    const value = line.slice(colon + 1).replace(/\r?\n(?=[ \t])/g, '').trim();
    (headers[name] ??= []).push(value);
  }
  return headers;
}

function addressesOf(field: AddressObject | AddressObject[] | undefined): string[] {
  const objects = field === undefined ? [] : Array.isArray(field) ? field : [field];
  return objects.flatMap((o) => o.value.flatMap((v) => (v.group ? v.group : [v]))).map((v) => v.address ?? '').filter(Boolean);
}

/** Where the header section ends: after the first empty line (CRLF CRLF, or LF LF from a lax client). */
function bodyStart(raw: string): number {
  const crlf = raw.indexOf('\r\n\r\n');
  const lf = raw.indexOf('\n\n');
  if (crlf >= 0 && (lf < 0 || crlf <= lf)) return crlf + 4;
  return lf >= 0 ? lf + 2 : raw.length;
}

export function toSinkMessage(raw: Buffer, parsed: ParsedMail, envelope: Envelope, received: Date): SinkMessage {
  const data = raw.toString('utf8');
  return {
    ID: crypto.randomUUID(),
    From: envelopeAddress(envelope.mailFrom),
    To: envelope.rcptTo.map(envelopeAddress),
    Content: { Headers: headersOf(parsed), Body: data.slice(bodyStart(data)), Size: raw.length, MIME: null },
    Created: received.toISOString(),
    MIME: null,
    Raw: { From: envelope.mailFrom ? envelope.mailFrom.address : '', To: envelope.rcptTo.map((r) => r.address), Data: data, Helo: envelope.helo },
    Parsed: {
      Subject: parsed.subject ?? '',
      From: parsed.from?.text ?? '',
      To: addressesOf(parsed.to),
      Date: parsed.date ? parsed.date.toISOString() : null,
      MessageID: parsed.messageId ?? null,
      Text: parsed.text ?? null,
      HTML: parsed.html || null,
    },
  };
}

/** A stored message read back from disk has at least the fields the sink relies on. */
export function isSinkMessage(value: unknown): value is SinkMessage {
  const m = value as SinkMessage;
  return (
    typeof m === 'object' && m !== null && typeof m.ID === 'string' && typeof m.Created === 'string' &&
    typeof m.Raw?.Data === 'string' && typeof m.Content?.Size === 'number' && typeof m.Parsed?.Subject === 'string'
  );
}
