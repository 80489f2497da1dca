import { act, fireEvent, screen, within } from '@testing-library/react-native';
import { onlineManager } from '@tanstack/react-query';
import { GrazingLog } from '@/components/grazing-log/grazing-log';
import { tokenStorage } from '@/hooks/auth/token-storage';
import { deviceStore } from '@/hooks/offline/device-store';
import { accountKeys } from '@/hooks/api/account';
import type { ContractLog } from '@/hooks/api/contracts';
import type { AccountView } from '@/lib/schemas/account';
import { renderWithProviders } from '../helpers/render-app';
import { contractFixture, entryFixture, figuresFixture, greta, routeFetch, wade } from '../helpers/contract-fixtures';

jest.setTimeout(30_000);

/**
 * Waits for the screen to catch up with the queue: the device store answers in promises outside any React
 * event, so each wait lets those settle inside act() (RNTL's waitFor polls outside act, and React then
 * holds the updates back).
 */
async function eventually(check: () => void, tries = 150) {
  for (let i = 0; ; i++) {
    try {
      check();
      return;
    } catch (err) {
      if (i >= tries) throw err;
    }
    await settle();
  }
}

function settle() {
  return act(async () => {
    await new Promise((r) => setTimeout(r, 20));
  });
}

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children, useRouter: () => ({ push: jest.fn() }) }));

// The phone's clock: Jan 22 2027, 08:00 at the block (16:00 UTC), two days after the flock went in.
const NOW = Date.parse('2027-01-22T16:00:00Z');
const contract = contractFixture();
const LOG_URL = `/api/contracts/${contract.id}/log`;

const moveIn = entryFixture({ clientId: 'c-in-20jan-0001', kind: 'move', at: '2027-01-20T07:30:00-08:00', change: 600, paddock: 'Rows 1–20' });
const log = (over: Partial<ContractLog> = {}): ContractLog => ({ items: [moveIn], figures: figuresFixture(), hasOlder: false, savedAt: null, ...over });

type Answer = { status: number; body?: unknown } | 'no-network';

/** Signs `user` in (token kept on the device, /api/me answers) and lets POST …/log answer from `answers` in turn. */
function api(user: AccountView, answers: Answer[]) {
  const posted: Array<Record<string, unknown>> = [];
  const fetchMock = routeFetch({
    'GET /api/me': () => ({ status: 200, body: { user } }),
    [`POST ${LOG_URL}`]: (init) => {
      const body = JSON.parse(String(init!.body));
      posted.push(body);
      const a = answers.shift() ?? 'no-network';
      if (a === 'no-network') throw new TypeError('Network request failed');
      return a.status < 400 ? { status: a.status, body: { entry: entryFixture({ ...body, id: `srv-${posted.length}` }) } } : a;
    },
  });
  global.fetch = fetchMock;
  return { posted, fetchMock };
}

async function renderLog(user: AccountView, data: ContractLog, side: 'grazier' | 'grower') {
  await tokenStorage.set('token-for-test');
  const utils = await renderWithProviders(<GrazingLog contract={contract} log={data} side={side} />);
  // The session asks /api/me for the signed-in account before the queue knows whose entries it holds.
  await eventually(() => expect(utils.queryClient.getQueryData(accountKeys.me('token-for-test'))).toEqual(user));
  // react-query tells its observers on the next turn (setTimeout 0): let the screens render with the account.
  await settle();
  return utils;
}

const textOf = (id: string) => {
  const children = screen.getByTestId(id).props.children;
  return Array.isArray(children) ? children.join('') : String(children);
};

beforeEach(async () => {
  jest.spyOn(Date, 'now').mockReturnValue(NOW);
  for (const k of await deviceStore.keys('')) await deviceStore.del(k);
});
afterEach(async () => {
  jest.restoreAllMocks();
  onlineManager.setOnline(true);
  await tokenStorage.set(null);
});

describe('The grazing log screen', () => {
  it("When the grazier opens the log, then the server's running figures, the chart and the entries show, and the four entry buttons are big", async () => {
    api(wade, []);
    const { queryClient } = await renderLog(wade, log(), 'grazier');
    expect(textOf('figure-head-now')).toBe('600');
    expect(textOf('figure-head-days')).toBe('1,212.5');
    expect(textOf('figure-eaten')).toBe('4,547 lb eaten of 36,000 lb target');
    expect(screen.getByTestId('log-chart').props['aria-label']).toMatch(/^Head on the block per day, Jan 20 to Jan 30: Jan 20 413, Jan 21 600, Jan 22 200\. Forage eaten 4,547 lb/);
    expect(screen.getByTestId('log-entry-c-in-20jan-0001')).toHaveTextContent(/7:30 AMAnimals in600 head · Rows 1–20/);
    for (const name of ['Animals in', 'Animals out', 'Daily tally', 'Observation']) {
      const button = screen.getByRole('button', { name });
      // Gloves-on size: at least 56 px tall (the big Button, and 64 for the four entry buttons).
      const style = [button.props.style].flat(Infinity).reduce((a: Record<string, unknown>, s: unknown) => ({ ...a, ...(s as object) }), {});
      expect(style.minHeight).toBeGreaterThanOrEqual(56);
    }
    queryClient.clear();
  });

  it('When the grazier logs a tally with no signal, then it is kept on the phone and shown waiting, and sent once with its client id when the connection returns', async () => {
    const { posted } = api(wade, ['no-network', { status: 201 }]);
    const { queryClient } = await renderLog(wade, log(), 'grazier');
    act(() => onlineManager.setOnline(false));
    expect(screen.getByText('No signal')).toBeTruthy();

    fireEvent.press(screen.getByRole('button', { name: 'Daily tally' }));
    // Prefilled with the head on the block; two presses of −1 for the two she could not find.
    expect(screen.getByLabelText('Head counted').props.value).toBe('600');
    fireEvent.press(screen.getByRole('button', { name: 'Minus 1 head counted' }));
    fireEvent.press(screen.getByRole('button', { name: 'Minus 1 head counted' }));
    fireEvent.press(screen.getByRole('button', { name: 'Save entry' }));

    await eventually(() => expect(screen.getByText('Saved on this phone. It will be sent when there is signal.')).toBeTruthy());
    await eventually(() => expect(textOf('queue-summary')).toBe('1 waiting to send'));
    expect(posted).toHaveLength(1);
    const clientId = posted[0].clientId as string;
    // The tally is in the log already, shaded as waiting on the phone.
    expect(screen.getByTestId(`log-entry-${clientId}`)).toHaveTextContent(/Daily tally598 head counted · Rows 1–20On this phone, waiting to send/);
    expect(screen.getByTestId(`queued-${clientId}`)).toHaveTextContent(/tried 1 time, last 8:00 AM · No connection/);

    act(() => onlineManager.setOnline(true));
    fireEvent.press(screen.getByRole('button', { name: 'Send now' }));
    await eventually(() => expect(textOf('queue-summary')).toBe('Everything written on this phone has been sent.'));
    expect(screen.getByTestId(`queued-${clientId}`)).toHaveTextContent(/✓ Sent 8:00 AM/);
    // Both tries carried the same entry and client id, so the server keeps it once; the time is the block's.
    expect(posted).toHaveLength(2);
    expect(posted[1]).toEqual(posted[0]);
    expect(posted[0]).toEqual({ clientId, kind: 'tally', at: '2027-01-22T08:00:00-08:00', count: 598, paddock: 'Rows 1–20' });
    expect(clientId).toMatch(/^[A-Za-z0-9_-]{8,64}$/);
    queryClient.clear();
  });

  it('When the animals go out while offline, then the phone works out head-days so far from every move (600 head × 48.5 h ÷ 24 = 1 212.5)', async () => {
    api(wade, ['no-network']);
    // The server's copy of the log was fetched on Jan 21 at noon, before the move out.
    const stale = log({ figures: figuresFixture({ headDaysSoFar: 712.5, eatenLb: 2671.875, byDay: [{ date: '2027-01-20', headDays: 412.5 }, { date: '2027-01-21', headDays: 300 }] }) });
    const { queryClient } = await renderLog(wade, stale, 'grazier');
    fireEvent.press(screen.getByRole('button', { name: 'Animals out' }));
    expect(screen.getByLabelText('Head out').props.value).toBe('600');
    fireEvent.press(screen.getByRole('button', { name: 'Save entry' }));
    await eventually(() => expect(textOf('figure-head-now')).toBe('0'));
    expect(textOf('figure-head-days')).toBe('1,212.5');
    // Forage eaten at the server's own lb per head-day (2 671.875 ÷ 712.5 = 3.75 lb).
    expect(textOf('figure-eaten')).toBe('4,547 lb eaten of 36,000 lb target');
    expect(screen.getByTestId('figures-include-queued')).toHaveTextContent(/Includes 1 move still waiting on this phone/);
    queryClient.clear();
  });

  it("When the server refuses a queued entry (400), then its message stays beside it; Fix it reopens the form with the field's message, and Discard drops it", async () => {
    const refusal = { status: 400, body: { error: { code: 'invalid', message: 'The entry does not fit the log', fields: { count: 'Head counted must be at most the 600 head on the block' } } } };
    const { posted } = api(wade, [refusal, { status: 201 }, refusal]);
    const { queryClient } = await renderLog(wade, log(), 'grazier');

    fireEvent.press(screen.getByRole('button', { name: 'Daily tally' }));
    fireEvent.press(screen.getByRole('button', { name: 'Plus 10 head counted' }));
    fireEvent.press(screen.getByRole('button', { name: 'Save entry' }));
    await eventually(() => expect(textOf('queue-summary')).toBe('1 not accepted'));
    const clientId = posted[0].clientId as string;
    const item = screen.getByTestId(`queued-${clientId}`);
    expect(item).toHaveTextContent(/Not accepted: The entry does not fit the log/);
    expect(item).toHaveTextContent(/Head counted must be at most the 600 head on the block/);
    // A refused entry is not part of the record.
    expect(screen.queryByTestId(`log-entry-${clientId}`)).toBeNull();

    fireEvent.press(within(item).getByRole('button', { name: 'Fix it' }));
    expect(screen.getByText('Fix: daily tally')).toBeTruthy();
    expect(screen.getByLabelText('Head counted').props.value).toBe('610');
    expect(screen.getAllByText('Head counted must be at most the 600 head on the block').length).toBeGreaterThanOrEqual(2);
    fireEvent.changeText(screen.getByLabelText('Head counted'), '597');
    fireEvent.press(screen.getByRole('button', { name: 'Save and send again' }));
    await eventually(() => expect(textOf('queue-summary')).toBe('Everything written on this phone has been sent.'));
    // The fix keeps the client id and the time it was first given.
    expect(posted[1]).toEqual({ ...posted[0], count: 597 });

    fireEvent.press(screen.getByRole('button', { name: 'Observation' }));
    fireEvent.press(screen.getByRole('button', { name: 'Save entry' }));
    await eventually(() => expect(textOf('queue-summary')).toBe('1 not accepted'));
    const second = posted[2].clientId as string;
    fireEvent.press(within(screen.getByTestId(`queued-${second}`)).getByRole('button', { name: 'Discard' }));
    await eventually(() => expect(screen.queryByTestId(`queued-${second}`)).toBeNull());
    queryClient.clear();
  });

  it('When the grazier records an observation, then the checks and percentages go with it in few taps', async () => {
    const { posted } = api(wade, [{ status: 201 }]);
    const { queryClient } = await renderLog(wade, log(), 'grazier');
    fireEvent.press(screen.getByRole('button', { name: 'Observation' }));
    fireEvent.changeText(screen.getByLabelText('Residual height'), '3.5');
    fireEvent.press(screen.getByRole('button', { name: 'Estimated % taken: 40 %' }));
    fireEvent.press(screen.getByRole('button', { name: 'Bare ground: 5 %' }));
    fireEvent.press(screen.getByRole('checkbox', { name: 'Water checked' }));
    fireEvent.press(screen.getByRole('checkbox', { name: 'Fence checked' }));
    fireEvent.press(screen.getByRole('button', { name: 'Plus 1 losses' }));
    fireEvent.changeText(screen.getByLabelText('Health and other notes'), 'One ewe lame, moved to the hospital pen.');
    fireEvent.press(screen.getByRole('button', { name: 'Save entry' }));
    await eventually(() => expect(posted).toHaveLength(1));
    expect(posted[0]).toEqual({
      clientId: posted[0].clientId,
      kind: 'observation',
      at: '2027-01-22T08:00:00-08:00',
      paddock: 'Rows 1–20',
      residualHeightIn: 3.5,
      takenPct: 40,
      bareGroundPct: 5,
      waterChecked: true,
      fenceChecked: true,
      losses: 1,
      note: 'One ewe lame, moved to the hospital pen.',
    });
    queryClient.clear();
  });

  it('When a time in the future is typed, then the form refuses it on the phone before it is queued', async () => {
    const { posted } = api(wade, []);
    const { queryClient } = await renderLog(wade, log(), 'grazier');
    fireEvent.press(screen.getByRole('button', { name: 'Daily tally' }));
    fireEvent.changeText(screen.getByLabelText('Time'), '2027-01-22T09:30');
    fireEvent.press(screen.getByRole('button', { name: 'Save entry' }));
    await eventually(() => expect(screen.getByText('Time must not be in the future')).toBeTruthy());
    expect(posted).toHaveLength(0);
    queryClient.clear();
  });

  it("When the grower opens the log, then she reads it with its flags, and may only add her own observation", async () => {
    api(greta, []);
    const late = entryFixture({ clientId: 'c-late-tally-01', kind: 'tally', at: '2027-01-22T07:00:00-08:00', count: 600, flags: ['After the animals-out-by date'] });
    const hers = entryFixture({ clientId: 'c-greta-obs-001', kind: 'observation', at: '2027-01-21T15:00:00-08:00', note: 'Rows 12–14 look bare near the gate.', author: 'grower' });
    const { queryClient } = await renderLog(greta, log({ items: [moveIn, hers, late] }), 'grower');
    expect(screen.queryByRole('button', { name: 'Animals in' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Daily tally' })).toBeNull();
    expect(screen.getByRole('button', { name: 'Add an observation' })).toBeTruthy();
    expect(screen.getByTestId('log-entry-c-late-tally-01')).toHaveTextContent(/Flagged: After the animals-out-by date/);
    expect(screen.getByTestId('log-entry-c-greta-obs-001')).toHaveTextContent(/grower's observation/);
    queryClient.clear();
  });

  it('When the copy on screen came from the phone (the network failed), then the screen says when it was saved', async () => {
    api(wade, []);
    const { queryClient } = await renderLog(wade, log({ savedAt: '2027-01-22T15:10:00.000Z' }), 'grazier');
    act(() => onlineManager.setOnline(false));
    expect(screen.getByText(/Showing the log as this phone saved it at Jan 22, 7:10 AM/)).toBeTruthy();
    queryClient.clear();
  });
});
