import { ApiError } from '@/hooks/api/client';
import { createDeviceCopies, setDeviceCopyOwner } from '@/hooks/offline/device-copies';
import { createMemoryStore } from '@/hooks/offline/device-store-types';

const SAVED_AT = Date.parse('2027-01-22T15:10:00Z');

function setup(slowMs = 50) {
  const store = createMemoryStore();
  const copies = createDeviceCopies(store, () => SAVED_AT, slowMs);
  return { store, copies };
}

const offline = () => Promise.reject(new ApiError(0, 'offline', 'Fieldfold could not be reached.'));

afterEach(() => setDeviceCopyOwner(null));

describe('Copies kept on the device', () => {
  it('When the network answers, then the answer is shown and kept; with no network the next read shows the kept copy and when it was saved', async () => {
    const { copies } = setup();
    setDeviceCopyOwner('acct-wade');
    await expect(copies.fetch('log/c1', async () => ({ headNow: 600 }))).resolves.toEqual({ data: { headNow: 600 }, savedAt: null });
    await expect(copies.fetch('log/c1', offline)).resolves.toEqual({ data: { headNow: 600 }, savedAt: '2027-01-22T15:10:00.000Z' });
  });

  it('When the network is too slow, then the kept copy is shown, and the late answer is kept for the next read', async () => {
    const { copies } = setup(30);
    setDeviceCopyOwner('acct-wade');
    await copies.fetch('log/c1', async () => ({ headNow: 600 }));
    let answer!: (v: { headNow: number }) => void;
    const late = new Promise<{ headNow: number }>((r) => (answer = r));
    await expect(copies.fetch('log/c1', () => late)).resolves.toEqual({ data: { headNow: 600 }, savedAt: '2027-01-22T15:10:00.000Z' });
    answer({ headNow: 0 });
    await late;
    await new Promise((r) => setTimeout(r, 0));
    await expect(copies.fetch('log/c1', offline)).resolves.toMatchObject({ data: { headNow: 0 } });
  });

  it('When the server answers 404 or 403, then no old copy hides it', async () => {
    const { copies } = setup();
    setDeviceCopyOwner('acct-wade');
    await copies.fetch('contract/c1', async () => ({ id: 'c1' }));
    await expect(copies.fetch('contract/c1', () => Promise.reject(new ApiError(404, 'not_found', 'Contract not found')))).rejects.toMatchObject({ status: 404 });
  });

  it("When another account is signed in, or the first signed out, then the first account's copies are neither read nor kept", async () => {
    const { copies, store } = setup();
    setDeviceCopyOwner('acct-wade');
    await copies.fetch('contracts', async () => ['wade’s']);
    setDeviceCopyOwner('acct-mirela');
    await expect(copies.fetch('contracts', offline)).rejects.toMatchObject({ status: 0 });
    await copies.forget('acct-wade');
    expect(await store.keys('copy/acct-wade/')).toEqual([]);
    setDeviceCopyOwner(null);
    await copies.fetch('contracts', async () => ['nobody’s']);
    expect(await store.keys('copy/')).toEqual([]);
  });
});
