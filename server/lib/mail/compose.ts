import { colors } from '../../../components/ui/theme';
import { escapeHtml } from './escape-html';

// One layout for every mail Fieldfold sends: a text part and an HTML part from the same parts, so the two
// always say the same thing. Values that people typed (block and business names, notes) arrive here as data
// and are escaped in the HTML; nothing here builds a header (nodemailer does, from the subject it is given).

/** A paragraph, or a bulleted list given as its items. Line breaks inside a paragraph are kept. */
export type MailBlock = string | string[];

export interface ComposeInput {
  subject: string;
  /** "Hello Greta," — left out when the mail goes to a role rather than a person. */
  greeting?: string;
  paragraphs: MailBlock[];
  /** A link into the app: `path` is an app route such as `/blocks/42`, joined to PUBLIC_URL. */
  action?: { label: string; path: string };
  /** Replaces the standard footer line. */
  footer?: string;
}

export interface ComposedMail {
  subject: string;
  text: string;
  html: string;
}

export const DEFAULT_FOOTER = 'You get this mail because you have a Fieldfold account.';

/**
 * An absolute link to `path` in the app at `publicUrl` (which may carry a base path such as /fieldfold).
 * Refuses anything that would leave the app's origin ("//elsewhere", "https://…"), so a route built from
 * data can never turn into a link to another site.
 */
export function appLink(publicUrl: string, path: string): string {
  if (!path.startsWith('/') || path.startsWith('//') || path.includes('\\')) throw new Error(`App link path must start with a single "/": ${JSON.stringify(path)}`);
  const base = new URL(publicUrl);
  const url = new URL(base.pathname.replace(/\/$/, '') + path, base.origin);
  if (url.origin !== base.origin) throw new Error('App link must stay on PUBLIC_URL');
  return url.href;
}

export function composeMail(input: ComposeInput, options: { publicUrl: string }): ComposedMail {
  const link = input.action ? { label: input.action.label, href: appLink(options.publicUrl, input.action.path) } : null;
  const footer = input.footer ?? DEFAULT_FOOTER;
  return { subject: input.subject, text: textPart(input, link, footer), html: htmlPart(input, link, footer) };
}

function textPart(input: ComposeInput, link: { label: string; href: string } | null, footer: string): string {
  const blocks: string[] = [];
  if (input.greeting) blocks.push(input.greeting);
  for (const p of input.paragraphs) blocks.push(typeof p === 'string' ? p : p.map((item) => `- ${item}`).join('\n'));
  // The address on a line of its own, so plain-text clients make it clickable.
  if (link) blocks.push(`${link.label}:\n${link.href}`);
  blocks.push(`--\nFieldfold\n${footer}`);
  return `${blocks.join('\n\n')}\n`;
}

// Inline styles only: many mail clients drop <style> blocks. Colours are the app's theme tokens.
const FONT = "'Public Sans', 'Helvetica Neue', Helvetica, Arial, sans-serif";
const S = {
  body: `margin:0;padding:0;background:${colors.paper};`,
  page: `max-width:560px;margin:0 auto;padding:24px 16px;font-family:${FONT};font-size:16px;line-height:23px;color:${colors.ink};`,
  brand: `margin:0 0 16px;font-family:Bitter, Georgia, serif;font-weight:700;font-size:20px;line-height:26px;color:${colors.coverDeep};`,
  card: `background:${colors.surface};border:1px solid ${colors.line};border-radius:10px;padding:24px;`,
  p: 'margin:0 0 16px;',
  ul: 'margin:0 0 16px;padding-left:22px;',
  button: `display:inline-block;background:${colors.cover};color:${colors.onCover};text-decoration:none;font-weight:600;padding:12px 20px;border-radius:10px;`,
  small: `margin:16px 0 0;font-size:13px;line-height:18px;color:${colors.inkMuted};`,
  smallLink: `color:${colors.sky};word-break:break-all;`,
};

function paragraphHtml(text: string): string {
  return `<p style="${S.p}">${text.split('\n').map(escapeHtml).join('<br>')}</p>`;
}

function htmlPart(input: ComposeInput, link: { label: string; href: string } | null, footer: string): string {
  const parts: string[] = [];
  if (input.greeting) parts.push(paragraphHtml(input.greeting));
  for (const p of input.paragraphs) {
    parts.push(typeof p === 'string' ? paragraphHtml(p) : `<ul style="${S.ul}">${p.map((item) => `<li>${escapeHtml(item)}</li>`).join('')}</ul>`);
  }
  if (link) {
    const href = escapeHtml(link.href);
    parts.push(`<p style="${S.p}"><a href="${href}" style="${S.button}">${escapeHtml(link.label)}</a></p>`);
    parts.push(`<p style="${S.small}">Or open <a href="${href}" style="${S.smallLink}">${href}</a></p>`);
  }
  return [
    '<!doctype html>',
    '<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">',
    `<title>${escapeHtml(input.subject)}</title></head>`,
    `<body style="${S.body}"><div style="${S.page}">`,
    `<p style="${S.brand}">Fieldfold</p>`,
    `<div style="${S.card}">${parts.join('')}</div>`,
    `<p style="${S.small}">${escapeHtml(footer)}</p>`,
    '</div></body></html>',
  ].join('\n');
}
