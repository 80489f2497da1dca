import { breakpoints, colors } from '../../../components/ui/theme';
import { escapeHtml } from '../../lib/mail/compose';
import type { SinkMessage } from './message';

// The sink's inbox page: plain HTML rendered on the server, no script. Every value from a message is escaped;
// a message's HTML part is shown only inside an iframe whose `sandbox` has no allow-scripts and no
// allow-same-origin, so it can neither run code nor reach this page. Below the wide breakpoint the list and
// the open message are separate pages; from it they sit side by side.

export const PAGE_SIZE = 50;

/** Content-Security-Policy of every page: nothing loads from elsewhere; the framed HTML inherits it. */
export const PAGE_CSP = "default-src 'none'; style-src 'unsafe-inline'; font-src 'self'; img-src data:; form-action 'self'; frame-ancestors 'none'";

const when = (iso: string) => {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'medium' });
};

function snippet(m: SinkMessage): string {
  const text = (m.Parsed.Text ?? '').replace(/\s+/g, ' ').trim();
  return text.length > 140 ? `${text.slice(0, 139)}…` : text;
}

function recipients(m: SinkMessage): string {
  return m.Parsed.To.length > 0 ? m.Parsed.To.join(', ') : m.Raw.To.join(', ');
}

function styles(fonts: boolean): string {
  const face = (family: string, file: string, weight: number) =>
    `@font-face{font-family:'${family}';src:url('/fonts/${file}') format('truetype');font-weight:${weight};font-display:swap}`;
  return `
${fonts ? face('Public Sans', 'PublicSans_400Regular.ttf', 400) + face('Public Sans', 'PublicSans_600SemiBold.ttf', 600) + face('Bitter', 'Bitter_700Bold.ttf', 700) : ''}
*{box-sizing:border-box}
html,body{margin:0;height:100%}
body{background:${colors.paper};color:${colors.ink};font:16px/23px 'Public Sans','Helvetica Neue',Arial,sans-serif}
a{color:${colors.sky}}
a:focus-visible,button:focus-visible,summary:focus-visible{outline:3px solid ${colors.focus};outline-offset:2px}
header{display:flex;flex-wrap:wrap;gap:8px 16px;align-items:center;justify-content:space-between;background:${colors.coverDeep};color:${colors.onCover};padding:12px 16px}
header h1{margin:0;font:700 20px/26px Bitter,Georgia,serif}
header h1 a{color:inherit;text-decoration:none}
header .sub{font-size:13px;line-height:18px;opacity:.85;display:block;font-family:'Public Sans',Arial,sans-serif;font-weight:400}
header nav{display:flex;gap:12px;align-items:center}
header nav a{color:${colors.onCover}}
button{font:600 14px/19px inherit;font-family:inherit;border-radius:10px;padding:8px 14px;cursor:pointer}
.danger{background:${colors.surface};color:${colors.danger};border:1px solid ${colors.dangerWash}}
main{display:block}
.list{list-style:none;margin:0;padding:0}
.list li{border-bottom:1px solid ${colors.line}}
.list a{display:block;padding:12px 16px;color:inherit;text-decoration:none;background:${colors.surface}}
.list a:hover{background:${colors.coverWash}}
.list a[aria-current=page]{background:${colors.coverWash};box-shadow:inset 4px 0 0 ${colors.cover}}
.subject{font-weight:600;display:block;overflow-wrap:anywhere}
.meta{font-size:13px;line-height:18px;color:${colors.inkMuted};display:flex;flex-wrap:wrap;gap:0 12px}
.snippet{font-size:14px;line-height:19px;color:${colors.inkMuted};display:block;margin-top:2px;overflow-wrap:anywhere}
.empty{padding:32px 16px;color:${colors.inkMuted}}
.pick{display:none;padding:24px;color:${colors.inkMuted}}
.pager{display:flex;justify-content:space-between;padding:12px 16px}
.message{padding:16px;min-width:0}
.message h2{margin:0 0 12px;font:700 22px/28px Bitter,Georgia,serif;overflow-wrap:anywhere}
.back{display:inline-block;margin-bottom:12px}
dl{display:grid;grid-template-columns:max-content 1fr;gap:4px 12px;margin:0 0 16px;font-size:14px;line-height:19px}
dt{color:${colors.inkMuted}}
dd{margin:0;overflow-wrap:anywhere}
h3{font-size:14px;line-height:19px;margin:16px 0 8px;color:${colors.inkMuted};text-transform:uppercase;letter-spacing:.04em}
iframe{display:block;width:100%;height:70vh;min-height:360px;border:1px solid ${colors.line};border-radius:10px;background:#fff}
pre{white-space:pre-wrap;overflow-wrap:anywhere;background:${colors.surface};border:1px solid ${colors.line};border-radius:10px;padding:12px;font:13px/18px ui-monospace,Menlo,Consolas,monospace;margin:0}
details{margin-top:16px}
summary{cursor:pointer;font-weight:600}
.headers td,.headers th{text-align:left;vertical-align:top;padding:2px 8px 2px 0;font-size:13px;line-height:18px;overflow-wrap:anywhere}
.headers th{color:${colors.inkMuted};font-weight:600;white-space:nowrap}
@media (min-width:${breakpoints.wide}px){
  .panes{display:grid;grid-template-columns:400px minmax(0,1fr);height:calc(100vh - 64px)}
  .panes>nav{overflow-y:auto;border-right:1px solid ${colors.lineStrong}}
  .panes>.message{overflow-y:auto;padding:24px}
  .back{display:none}
  .pick{display:block}
}
@media (max-width:${breakpoints.wide - 1}px){
  .panes.reading>nav{display:none}
}`;
}

function layout(title: string, body: string, total: number, fonts: boolean): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="referrer" content="same-origin"><title>${escapeHtml(title)}</title><style>${styles(fonts)}</style></head>
<body><header><h1><a href="/">Fieldfold mail<span class="sub">Local sink: nothing here left this machine</span></a></h1>
<nav><span>${total} ${total === 1 ? 'message' : 'messages'}</span><a href="/api/v2/messages">JSON</a>
<form method="post" action="/clear"><button class="danger" type="submit"${total === 0 ? ' disabled' : ''}>Empty inbox</button></form></nav></header>
${body}</body></html>`;
}

function listHtml(items: SinkMessage[], total: number, start: number, openId: string | null): string {
  if (total === 0) return '<p class="empty">No mail yet. Whatever Fieldfold sends while this sink runs lands here.</p>';
  const rows = items
    .map((m) => {
      const current = m.ID === openId ? ' aria-current="page"' : '';
      return `<li><a href="/messages/${encodeURIComponent(m.ID)}"${current}><span class="subject">${escapeHtml(m.Parsed.Subject || '(no subject)')}</span>
<span class="meta"><span>To ${escapeHtml(recipients(m))}</span><time datetime="${escapeHtml(m.Created)}">${escapeHtml(when(m.Created))}</time></span>
<span class="snippet">${escapeHtml(snippet(m))}</span></a></li>`;
    })
    .join('\n');
  const newer = start > 0 ? `<a href="/?start=${Math.max(0, start - PAGE_SIZE)}">← Newer</a>` : '<span></span>';
  const older = start + items.length < total ? `<a href="/?start=${start + items.length}">Older →</a>` : '<span></span>';
  return `<ul class="list">${rows}</ul>${total > PAGE_SIZE ? `<div class="pager">${newer}${older}</div>` : ''}`;
}

/** The HTML part as a sandboxed document: links open in a new tab, outside the sandbox. */
function framedHtml(html: string): string {
  return `<!doctype html><html><head><meta charset="utf-8"><base target="_blank"></head><body>${html}</body></html>`;
}

function messageHtml(m: SinkMessage): string {
  const headerRows = Object.entries(m.Content.Headers)
    .flatMap(([name, values]) => values.map((v) => `<tr><th scope="row">${escapeHtml(name)}</th><td>${escapeHtml(v)}</td></tr>`))
    .join('');
  const html = m.Parsed.HTML
    ? `<h3>HTML part</h3><iframe title="HTML part of the message" sandbox="allow-popups allow-popups-to-escape-sandbox" referrerpolicy="no-referrer" srcdoc="${escapeHtml(framedHtml(m.Parsed.HTML))}"></iframe>`
    : '';
  const text = m.Parsed.Text !== null ? `<h3>Text part</h3><pre>${escapeHtml(m.Parsed.Text)}</pre>` : '';
  return `<article class="message" aria-labelledby="subject"><a class="back" href="/">← Inbox</a>
<h2 id="subject">${escapeHtml(m.Parsed.Subject || '(no subject)')}</h2>
<dl><dt>From</dt><dd>${escapeHtml(m.Parsed.From || m.Raw.From)}</dd><dt>To</dt><dd>${escapeHtml(recipients(m))}</dd>
<dt>Received</dt><dd><time datetime="${escapeHtml(m.Created)}">${escapeHtml(when(m.Created))}</time></dd>
<dt>Size</dt><dd>${m.Content.Size.toLocaleString('en-US')} bytes · <a href="/messages/${encodeURIComponent(m.ID)}/raw">source</a></dd></dl>
${html}${text}
<details><summary>Headers</summary><table class="headers"><tbody>${headerRows}</tbody></table></details></article>`;
}

export function inboxPage(p: { items: SinkMessage[]; total: number; start: number; open: SinkMessage | null; fonts: boolean }): string {
  const body = `<main class="panes${p.open ? ' reading' : ''}"><nav aria-label="Messages">${listHtml(p.items, p.total, p.start, p.open?.ID ?? null)}</nav>
${p.open ? messageHtml(p.open) : p.total > 0 ? '<p class="pick">Choose a message to read it.</p>' : ''}</main>`;
  return layout(p.open ? `${p.open.Parsed.Subject || '(no subject)'} · Fieldfold mail` : 'Fieldfold mail', body, p.total, p.fonts);
}

export function notFoundPage(total: number, fonts: boolean): string {
  return layout('Not found · Fieldfold mail', '<main><p class="empty">That message is not in the inbox (it may have been emptied). <a href="/">Back to the inbox</a></p></main>', total, fonts);
}
