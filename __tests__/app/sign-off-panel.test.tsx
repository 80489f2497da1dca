import { act, fireEvent, screen } from '@testing-library/react-native';
import { SignOffPanel } from '@/components/contracts/sign-off-panel';
import type { SignOffView } from '@/lib/schemas/contract';
import { renderWithProviders } from '../helpers/render-app';
import { contractFixture, figuresFixture, routeFetch } from '../helpers/contract-fixtures';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children, useRouter: () => ({ push: jest.fn() }) }));

const SIGN_OFF_URL = 'POST /api/contracts/contract-olsen-1/sign-off';
// The flock came out on Jan 22 at 08:00: 1 212.5 head-days by the log (figuresFixture), none on the block now.
const out = figuresFixture({ headNow: 0 });

function round(over: Partial<SignOffView>): SignOffView {
  return {
    id: 'so-1',
    round: 1,
    status: 'proposed',
    proposedHeadDays: 1212.5,
    proposedAt: '2027-01-22T17:00:00.000Z',
    byDay: out.byDay,
    comment: null,
    counterHeadDays: null,
    disputeComment: null,
    disputedAt: null,
    agreedHeadDays: null,
    agreedAt: null,
    agreedBy: null,
    grazierName: 'Wade Kellner',
    growerName: null,
    ...over,
  };
}

async function settle() {
  await act(async () => {
    await new Promise((r) => setTimeout(r, 30));
  });
}

function sent(fetchMock: jest.Mock) {
  return fetchMock.mock.calls.filter(([url]) => String(url).endsWith('/sign-off')).map(([, init]) => JSON.parse(String(init.body)));
}

describe('Sign-off', () => {
  it('When animals are still on the block by the log, then the grazier is told to log them out before proposing', async () => {
    global.fetch = routeFetch({});
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={contractFixture()} figures={figuresFixture()} side="grazier" waitingOnPhone={0} />);
    expect(screen.getByText('Animals are still on the block')).toBeTruthy();
    expect(screen.queryByTestId('propose-head-days')).toBeNull();
    queryClient.clear();
  });

  it('When entries still wait on the phone, then proposing waits for them', async () => {
    global.fetch = routeFetch({});
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={contractFixture()} figures={out} side="grazier" waitingOnPhone={2} />);
    expect(screen.getByText('Entries still waiting to send')).toBeTruthy();
    expect(screen.queryByTestId('propose-head-days')).toBeNull();
    queryClient.clear();
  });

  it('When the animals are out, then the grazier proposes what the log adds up to, day by day; the server counts it, so no figure is sent', async () => {
    const fetchMock = routeFetch({ [SIGN_OFF_URL]: () => ({ status: 200, body: { contract: contractFixture({ status: 'sign-off' }) } }) });
    global.fetch = fetchMock;
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={contractFixture()} figures={out} side="grazier" waitingOnPhone={0} />);
    expect(screen.getByTestId('breakdown-total')).toHaveTextContent('1,212.5');
    expect(screen.getByText('Jan 20, 2027')).toBeTruthy();
    fireEvent.changeText(screen.getByLabelText('Note to the grower (optional)'), 'Out on the 22nd: the residual reached 3 in.');
    fireEvent.press(screen.getByTestId('propose-head-days'));
    await settle();
    expect(sent(fetchMock)).toEqual([{ action: 'propose', comment: 'Out on the 22nd: the residual reached 3 in.' }]);
    queryClient.clear();
  });

  it('When the grower disputes, then a counter figure and a reason are both required, and sent together', async () => {
    const fetchMock = routeFetch({ [SIGN_OFF_URL]: () => ({ status: 200, body: { contract: contractFixture({ status: 'sign-off' }) } }) });
    global.fetch = fetchMock;
    const proposed = contractFixture({ status: 'sign-off', signOff: round({}) });
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={proposed} figures={out} side="grower" waitingOnPhone={0} />);
    expect(screen.getByText('Proposed, day by day')).toBeTruthy();
    fireEvent.press(screen.getByRole('button', { name: 'Dispute…' }));
    fireEvent.press(screen.getByRole('button', { name: 'Send the dispute' }));
    await settle();
    expect(screen.getByText('Give the head-days you would agree to')).toBeTruthy();
    expect(screen.getByText('Say what you see differently, so the grazier can check the log')).toBeTruthy();
    expect(sent(fetchMock)).toEqual([]);

    fireEvent.changeText(screen.getByLabelText('Head-days you would agree to'), '1090.5');
    fireEvent.changeText(screen.getByLabelText('Why'), 'The tally on Jan 21 shows 540 head, not 600.');
    fireEvent.press(screen.getByRole('button', { name: 'Send the dispute' }));
    await settle();
    expect(sent(fetchMock)).toEqual([{ action: 'dispute', headDays: 1090.5, comment: 'The tally on Jan 21 shows 540 head, not 600.' }]);
    queryClient.clear();
  });

  it('When the grower approves, then only the action is sent', async () => {
    const fetchMock = routeFetch({ [SIGN_OFF_URL]: () => ({ status: 200, body: { contract: contractFixture({ status: 'agreed' }) } }) });
    global.fetch = fetchMock;
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={contractFixture({ status: 'sign-off', signOff: round({}) })} figures={out} side="grower" waitingOnPhone={0} />);
    fireEvent.press(screen.getByTestId('approve-head-days'));
    await settle();
    expect(sent(fetchMock)).toEqual([{ action: 'approve' }]);
    queryClient.clear();
  });

  it('When the grower countered, then the grazier may accept the counter or amend the log and propose again', async () => {
    const fetchMock = routeFetch({ [SIGN_OFF_URL]: () => ({ status: 200, body: { contract: contractFixture({ status: 'agreed' }) } }) });
    global.fetch = fetchMock;
    const disputed = contractFixture({
      status: 'sign-off',
      signOff: round({ status: 'disputed', counterHeadDays: 1090.5, disputeComment: 'The tally on Jan 21 shows 540 head.', disputedAt: '2027-01-23T18:00:00.000Z', growerName: 'Greta Olsen' }),
    });
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={disputed} figures={out} side="grazier" waitingOnPhone={0} />);
    expect(screen.getByText('Disputed: the grower counters with 1,090.5 head-days')).toBeTruthy();
    expect(screen.getByText('“The tally on Jan 21 shows 540 head.”')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Open the grazing log' })).toBeTruthy();
    expect(screen.getByTestId('propose-head-days')).toHaveTextContent('Propose again: 1,212.5 head-days');
    fireEvent.press(screen.getByTestId('accept-counter'));
    await settle();
    expect(sent(fetchMock)).toEqual([{ action: 'accept-counter' }]);
    queryClient.clear();
  });

  it('When the head-days are agreed, then the figure is locked with who proposed, who countered and who agreed, and when', async () => {
    global.fetch = routeFetch({});
    const agreed = contractFixture({
      status: 'agreed',
      agreedHeadDays: 1090.5,
      signOff: round({
        status: 'agreed',
        counterHeadDays: 1090.5,
        disputedAt: '2027-01-23T18:00:00.000Z',
        growerName: 'Greta Olsen',
        agreedHeadDays: 1090.5,
        agreedAt: '2027-01-24T16:30:00.000Z',
        agreedBy: 'grazier',
      }),
    });
    const { queryClient } = await renderWithProviders(<SignOffPanel contract={agreed} figures={out} side="grower" waitingOnPhone={0} />);
    expect(screen.getByTestId('agreed-head-days')).toHaveTextContent('1,090.5');
    expect(screen.getByText('Proposed by Wade Kellner (1,212.5), Jan 22, 9:00 AM')).toBeTruthy();
    expect(screen.getByText('Countered by Greta Olsen (1,090.5), Jan 23, 10:00 AM')).toBeTruthy();
    expect(screen.getByText('Agreed when Wade Kellner accepted the counter, Jan 24, 8:30 AM')).toBeTruthy();
    expect(screen.queryByRole('button', { name: /Approve|Dispute/ })).toBeNull();
    queryClient.clear();
  });
});
