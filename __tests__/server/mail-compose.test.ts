import { appLink, composeMail, DEFAULT_FOOTER } from '../../server/lib/mail/compose';
import { escapeHtml } from '../../server/lib/mail/escape-html';

const PUBLIC_URL = 'http://localhost:8080';

describe('composeMail', () => {
  const hostile = `<script>alert("x")</script> & 'Sons' <img src=x onerror=alert(1)>`;

  it('When a block name and notes hold markup, then the HTML part shows them as text and the text part keeps them verbatim', () => {
    const mail = composeMail(
      {
        subject: `New bid on ${hostile}`,
        greeting: 'Hello Greta,',
        paragraphs: [`Haas Brush Goats bid on ${hostile}.`, 'Gate code at the office.\nCall first.', ['First <b>item</b>', 'Second & last']],
        action: { label: 'Compare the bids', path: '/blocks/b-42' },
      },
      { publicUrl: PUBLIC_URL },
    );
    expect(mail.html).not.toContain('<script>');
    expect(mail.html).not.toContain('<img');
    expect(mail.html).not.toContain('<b>item');
    expect(mail.html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;Sons&#39; &lt;img src=x onerror=alert(1)&gt;');
    expect(mail.html).toContain(`<title>New bid on ${escapeHtml(hostile)}</title>`);
    expect(mail.html).toContain('Gate code at the office.<br>Call first.');
    expect(mail.html).toContain('<li>First &lt;b&gt;item&lt;/b&gt;</li><li>Second &amp; last</li>');
    expect(mail.text).toBe(
      `Hello Greta,\n\nHaas Brush Goats bid on ${hostile}.\n\nGate code at the office.\nCall first.\n\n- First <b>item</b>\n- Second & last\n\n` +
        `Compare the bids:\nhttp://localhost:8080/blocks/b-42\n\n--\nFieldfold\n${DEFAULT_FOOTER}\n`,
    );
    expect(mail.subject).toBe(`New bid on ${hostile}`);
  });

  it('When there is an action, then both parts carry the same absolute link into the app, as a button and as text', () => {
    const mail = composeMail({ subject: 'Contract ready', paragraphs: ['Sign it.'], action: { label: 'Open the contract', path: '/contracts/c-1?tab=terms&x=1' } }, { publicUrl: PUBLIC_URL });
    expect(mail.text).toContain('Open the contract:\nhttp://localhost:8080/contracts/c-1?tab=terms&x=1\n');
    // The ampersand is escaped in the attribute; a browser reads it back as "&".
    expect(mail.html.match(/href="([^"]+)"/g)).toEqual(['href="http://localhost:8080/contracts/c-1?tab=terms&amp;x=1"', 'href="http://localhost:8080/contracts/c-1?tab=terms&amp;x=1"']);
    expect(mail.html).toContain('>Open the contract</a>');
  });

  it('When there is no action and no greeting, then neither part invents one', () => {
    const mail = composeMail({ subject: 'Block withdrawn', paragraphs: ['Nothing more is needed from you.'], footer: 'Fieldfold, Calder Valley.' }, { publicUrl: PUBLIC_URL });
    expect(mail.html).not.toContain('<a ');
    expect(mail.text).toBe('Nothing more is needed from you.\n\n--\nFieldfold\nFieldfold, Calder Valley.\n');
  });
});

describe('appLink', () => {
  it('When PUBLIC_URL has a base path, then links go under it', () => {
    expect(appLink('https://fieldfold.example/app/', '/blocks/1')).toBe('https://fieldfold.example/app/blocks/1');
    expect(appLink('https://fieldfold.example', '/blocks/1')).toBe('https://fieldfold.example/blocks/1');
  });

  it('When a path would leave the app (protocol-relative, absolute, backslash, relative), then it throws', () => {
    for (const bad of ['//evil.example/x', 'https://evil.example/', '/\\evil.example', 'blocks/1', 'javascript:alert(1)']) {
      expect(() => appLink(PUBLIC_URL, bad)).toThrow(/App link/);
    }
  });
});

describe('escapeHtml', () => {
  it('When text holds the five HTML-special characters, then each becomes its entity and nothing else changes', () => {
    expect(escapeHtml(`a&b<c>d"e'f é 🐐`)).toBe('a&amp;b&lt;c&gt;d&quot;e&#39;f é 🐐');
    expect(escapeHtml('&amp;')).toBe('&amp;amp;');
  });
});
