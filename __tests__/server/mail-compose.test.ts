import { composeMail, escapeHtml } from '../../server/lib/mail/compose';
import { appLinks } from '../../server/lib/mail/links';

// The one mail layout (server/lib/mail/compose.ts): values people typed arrive as data, are shown as text in
// the HTML part (never as markup), stay verbatim in the text part, and never turn into a header.

const links = appLinks('http://localhost:8080/');
const hostile = `<script>alert("x")</script> & 'Sons' <img src=x onerror=alert(1)>`;
const escaped = '&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;Sons&#39; &lt;img src=x onerror=alert(1)&gt;';

describe('composeMail', () => {
  const mail = composeMail({
    to: 'greta@calder.example',
    subject: `New bid on ${hostile}`,
    greeting: `Hello ${hostile},`,
    paragraphs: [`Haas Brush Goats bid on ${hostile}.`, 'Gate code at the office.\nCall first.'],
    facts: [[`Block ${hostile}`, `${hostile} 10 800 head-days`]],
    caution: `Animals out by 2027-03-01 <b>before bloom</b>`,
    action: { label: `Compare the bids on ${hostile}`, url: `${links.block('b-42')}?tab=bids&sort=total` },
  });
  const html = mail.html ?? '';

  it('When names, facts, the caution and the action label hold markup, then the HTML part shows each as escaped text', () => {
    expect(html).not.toMatch(/<script|<img|<b>/);
    // greeting, paragraph, fact label, fact value, action label: each escaped where it stands.
    expect(html.split(escaped).length - 1).toBe(5);
    expect(html).toContain('Animals out by 2027-03-01 &lt;b&gt;before bloom&lt;/b&gt;');
  });

  it('When a paragraph holds a line break, then the HTML part shows it as <br> and the text part keeps it', () => {
    expect(html).toContain('Gate code at the office.<br>Call first.');
    expect(mail.text).toContain('Gate code at the office.\nCall first.');
  });

  it('When there is an action, then both parts carry the same absolute link into the app, escaped in the attribute', () => {
    expect(html).toContain('href="http://localhost:8080/blocks/b-42?tab=bids&amp;sort=total"');
    expect(mail.text).toContain('http://localhost:8080/blocks/b-42?tab=bids&sort=total');
  });

  it('When typed values hold markup, then the text part carries them verbatim (text is not HTML)', () => {
    expect(mail.text).toContain(`Hello ${hostile},`);
    expect(mail.text).toContain(`Haas Brush Goats bid on ${hostile}.`);
  });

  it('When a subject carries CR LF or other control characters, then the composed subject is one line', () => {
    const m = composeMail({ to: 'a@b.example', subject: 'Block changed: North\r\nBcc: thief@elsewhere.example\u2028\tx', paragraphs: ['x'] });
    expect(m.subject).toBe('Block changed: North Bcc: thief@elsewhere.example x');
    expect(m.to).toBe('a@b.example');
  });
});

describe('escapeHtml', () => {
  it('When text holds the five HTML-special characters, then each becomes its entity and nothing else changes', () => {
    expect(escapeHtml(`a&b<c>d"e'f é 🐐`)).toBe('a&amp;b&lt;c&gt;d&quot;e&#39;f é 🐐');
    expect(escapeHtml('&amp;')).toBe('&amp;amp;');
  });
});

describe('appLinks', () => {
  it('When a record id holds URL syntax, then the link still points at that record in the app', () => {
    expect(links.block('a/../../x?y#z')).toBe('http://localhost:8080/blocks/a%2F..%2F..%2Fx%3Fy%23z');
    expect(appLinks('https://fieldfold.example/app').contract('c 1')).toBe('https://fieldfold.example/app/contracts/c%201');
  });
});
