import { matchWebRoute, webRouteTable } from '../../server/lib/http/web-routes';

// The HTML files `expo export` wrote for Fieldfold (web.output "static"), groups' duplicates included,
// plus a screen issue 8 adds (the grazing log under a contract) and a catch-all.
const EXPORTED = [
  '+not-found.html',
  '_sitemap.html',
  'index.html',
  'sign-in.html',
  'sign-up.html',
  'calculator.html',
  'bids.html',
  'contracts.html',
  'invoices.html',
  'account.html',
  'blocks/new.html',
  'blocks/[blockId].html',
  'blocks/[blockId]/bid.html',
  'blocks/[blockId]/edit.html',
  'contracts/[contractId].html',
  'contracts/[contractId]/log.html',
  'help/[...topic].html',
  '(app)/index.html',
  '(app)/bids.html',
  '(app)/(tabs)/index.html',
  '(app)/blocks/[blockId].html',
  '(auth)/sign-in.html',
  '(tabs)/account.html',
];

const table = webRouteTable(EXPORTED);
const match = (p: string) => matchWebRoute(table, p);

describe('the route table read from the exported HTML files', () => {
  it('When a path names a screen, then its own file answers, with or without a trailing slash', () => {
    expect(match('/')).toBe('index.html');
    expect(match('/sign-in')).toBe('sign-in.html');
    expect(match('/sign-in/')).toBe('sign-in.html');
    expect(match('/calculator')).toBe('calculator.html');
  });

  it('When a path has an id in it, then the dynamic segment matches it, and a static neighbour still wins', () => {
    expect(match('/blocks/42')).toBe('blocks/[blockId].html');
    expect(match('/blocks/new')).toBe('blocks/new.html');
    expect(match('/blocks/42/bid')).toBe('blocks/[blockId]/bid.html');
    expect(match('/blocks/42/edit/')).toBe('blocks/[blockId]/edit.html');
    expect(match('/contracts')).toBe('contracts.html');
    expect(match('/contracts/7')).toBe('contracts/[contractId].html');
    expect(match('/contracts/7/log')).toBe('contracts/[contractId]/log.html');
    expect(match('/help/fences/electric')).toBe('help/[...topic].html');
  });

  it('When a path matches no screen, or names a group or the sitemap, then no route answers and the 404 page is known', () => {
    expect(match('/blocks/42/photos')).toBeNull();
    expect(match('/(app)/bids')).toBeNull();
    expect(match('/_sitemap')).toBeNull();
    expect(table.notFound).toBe('+not-found.html');
    expect(table.routes.map((r) => r.file)).not.toContain('(app)/index.html');
  });

  it('When routes are listed, then static segments come before parameters, which come before catch-alls', () => {
    const files = table.routes.map((r) => r.file);
    expect(files.indexOf('blocks/new.html')).toBeLessThan(files.indexOf('blocks/[blockId].html'));
    expect(table.routes.find((r) => r.file === 'blocks/[blockId].html')).toMatchObject({ pattern: '^/blocks/[^/]+$', dynamic: true });
    expect(table.routes.find((r) => r.file === 'sign-in.html')).toMatchObject({ pattern: '^/sign-in$', dynamic: false });
  });
});
