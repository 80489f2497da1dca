import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ConfigError, loadConfig } from '../../server/config/env';

// The mail settings of server/config/env.ts: SMTP only when SMTP_PORT is set, a From that is one address.

let root: string;
beforeEach(() => {
  root = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-config-'));
});
afterEach(() => fs.rmSync(root, { recursive: true, force: true }));

const load = (env: Record<string, string>) => loadConfig({ DATA_DIR: 'data', ...env }, root);

describe('mail configuration', () => {
  it('When SMTP_PORT is not set, then mail stays in memory and From is the Fieldfold default', () => {
    const c = load({});
    expect(c.smtp).toBeNull();
    expect(c.mailFrom).toEqual({ name: 'Fieldfold', address: 'no-reply@fieldfold.localhost' });
    expect(c.mailUiPort).toBeNull();
  });

  it('When npm start sets SMTP_PORT and MAIL_UI_PORT, then mail goes to 127.0.0.1 on that port', () => {
    const c = load({ SMTP_PORT: '1025', MAIL_UI_PORT: '8025', MAIL_FROM: 'Calder Valley Fieldfold <mail@calder.example>' });
    expect(c.smtp).toEqual({ host: '127.0.0.1', port: 1025 });
    expect(c.mailUiPort).toBe(8025);
    expect(c.mailFrom).toEqual({ name: 'Calder Valley Fieldfold', address: 'mail@calder.example' });
  });

  it.each([
    [{ SMTP_PORT: 'twenty-five' }, 'SMTP_PORT must be a port number'],
    [{ SMTP_PORT: '70000' }, 'SMTP_PORT must be from 1 to 65535'],
    [{ MAIL_UI_PORT: '0' }, 'MAIL_UI_PORT must be from 1 to 65535'],
    [{ SMTP_HOST: 'mail host\r\n' }, 'SMTP_HOST must be a host name or IP address'],
    [{ MAIL_FROM: 'a@b.example, c@d.example' }, 'MAIL_FROM must be one address'],
    [{ MAIL_FROM: 'Fieldfold\r\nBcc: x@y.example <a@b.example>' }, 'MAIL_FROM must be one address'],
    [{ MAIL_FROM: 'no address here' }, 'MAIL_FROM must be one address'],
  ])('When %j, then the server refuses to start with a sentence naming the variable', (env, message) => {
    expect(() => load(env)).toThrow(ConfigError);
    expect(() => load(env)).toThrow(message);
  });
});
