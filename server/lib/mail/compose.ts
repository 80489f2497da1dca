import type { MailMessage } from './mail-port';
import { colors } from '../../../components/ui/theme';

// One layout for every message Fieldfold sends: a text part and an HTML part from the same content. Values
// users typed (block, business and person names, notes) arrive as data and are escaped here; headers are
// built by the mail library from `to` and `subject` only (and single-line fields refuse control characters
// at input, lib/schemas/fields.ts), so no typed text can add a header.

export interface MailContent {
  to: string;
  subject: string;
  /** "Hello Greta," — omitted when we do not know a name. */
  greeting?: string;
  /** Plain paragraphs; a paragraph may hold line breaks (shown as lines). */
  paragraphs: string[];
  /** Key facts shown as a short list ("Head-days: 10 800"). */
  facts?: Array<[label: string, value: string]>;
  /** The one thing to do next, as a link into the app. */
  action?: { label: string; url: string };
  /** A caution that goes with this message (e.g. the out-by date), shown set apart. */
  caution?: string;
}

const FOOTER = 'Fieldfold — contract grazing records. You get this mail because you have an account with a block, bid or contract it concerns.';

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** Header values must be one line: collapse any stray line break or control character to a space. */
function oneLine(s: string): string {
  // eslint-disable-next-line no-control-regex
  return s.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, ' ').trim();
}

export function composeMail(c: MailContent): MailMessage {
  const text = [
    c.greeting,
    ...c.paragraphs,
    c.facts?.length ? c.facts.map(([k, v]) => `${k}: ${v}`).join('\n') : undefined,
    c.caution ? `Caution: ${c.caution}` : undefined,
    c.action ? `${c.action.label}: ${c.action.url}` : undefined,
    `—\n${FOOTER}`,
  ]
    .filter((p): p is string => Boolean(p))
    .join('\n\n');

  const p = (s: string) => `<p style="margin:0 0 14px">${escapeHtml(s).replace(/\n/g, '<br>')}</p>`;
  const html = `<!doctype html><html><body style="margin:0;background:${colors.paper};font-family:'Public Sans',Arial,sans-serif;color:${colors.ink}">
<div style="max-width:560px;margin:0 auto;padding:24px 20px">
<div style="font-family:Bitter,Georgia,serif;font-weight:700;font-size:20px;color:${colors.coverDeep};margin-bottom:18px">Fieldfold</div>
${c.greeting ? p(c.greeting) : ''}${c.paragraphs.map(p).join('')}${
    c.facts?.length
      ? `<table style="border-collapse:collapse;margin:0 0 14px">${c.facts
          .map(([k, v]) => `<tr><td style="padding:2px 12px 2px 0;color:${colors.inkMuted}">${escapeHtml(k)}</td><td style="padding:2px 0;font-weight:600">${escapeHtml(v)}</td></tr>`)
          .join('')}</table>`
      : ''
  }${c.caution ? `<p style="margin:0 0 14px;padding:10px 12px;border-left:4px solid ${colors.cautionLine};background:${colors.cautionWash}">${escapeHtml(c.caution)}</p>` : ''}${
    c.action
      ? `<p style="margin:18px 0"><a href="${escapeHtml(c.action.url)}" style="display:inline-block;background:${colors.coverDeep};color:${colors.onCover};text-decoration:none;padding:12px 18px;border-radius:8px;font-weight:600">${escapeHtml(c.action.label)}</a></p>`
      : ''
  }<p style="margin:24px 0 0;font-size:12px;color:${colors.inkFaint}">${escapeHtml(FOOTER)}</p>
</div></body></html>`;
  return { to: c.to, subject: oneLine(c.subject), text, html };
}
