import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { ContractDetail } from '@/components/contracts/contract-detail';
import { renderWithProviders } from '../helpers/render-app';
import { contractFixture, greta, routeFetch, TERMS_HASH, wade } from '../helpers/contract-fixtures';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children, useRouter: () => ({ push: jest.fn() }) }));

/** Awaiting signatures: the grower signed on Dec 11, the grazier (the viewer) has not. */
const toSign = contractFixture({ status: 'to-sign', signatures: [contractFixture().signatures![0]] });

const textOf = (id: string) => {
  const children = screen.getByTestId(id).props.children;
  return Array.isArray(children) ? children.join('') : String(children);
};

describe('Signing a contract', () => {
  it("When the grazier opens a contract the grower signed, then it says it is his move, shows both parties' state and the terms fingerprint, short then full on tap", async () => {
    global.fetch = routeFetch({});
    const { queryClient } = await renderWithProviders(<ContractDetail contract={toSign} viewerId={wade.id} viewerName={wade.name} />);
    expect(textOf('next-step')).toBe('Read the terms and cautions, then sign');
    expect(screen.getByTestId('signature-grower')).toHaveTextContent(/Signed as “Greta Olsen”, Dec 11, 9:00 AM · terms 3f9a c2d1/);
    expect(screen.getByTestId('signature-grazier')).toHaveTextContent(/Kellner Range Sheep \(Wade Kellner\)Not signed yet/);
    // The cautions are on the page with the sign panel, above it.
    expect(screen.getByText('No spray records entered')).toBeTruthy();

    const fingerprint = screen.getByTestId('terms-fingerprint');
    expect(fingerprint).toHaveTextContent(/3f9a c2d1 …/);
    fireEvent.press(fingerprint);
    expect(fingerprint).toHaveTextContent(new RegExp(TERMS_HASH.replace(/(.{4})/g, '$1 ').trim()));
    queryClient.clear();
  });

  it('When the name is missing and the cautions are not ticked, then the shared schema says so beside each and nothing is sent', async () => {
    const fetchMock = routeFetch({});
    global.fetch = fetchMock;
    const { queryClient } = await renderWithProviders(<ContractDetail contract={toSign} viewerId={wade.id} viewerName={wade.name} />);
    fireEvent.press(screen.getByRole('button', { name: 'Sign the contract' }));
    expect(await screen.findByText('Type your full name to sign')).toBeTruthy();
    expect(screen.getByText('Tick that you have read the cautions')).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
    queryClient.clear();
  });

  it('When the grazier types his name and ticks the cautions, then the signature carries the name, the tick and the fingerprint of the terms he read', async () => {
    const fetchMock = routeFetch({
      [`POST /api/contracts/${toSign.id}/sign`]: () => ({ status: 200, body: { contract: { ...toSign, status: 'signed' } } }),
    });
    global.fetch = fetchMock;
    const { queryClient } = await renderWithProviders(<ContractDetail contract={toSign} viewerId={wade.id} viewerName={wade.name} />);
    fireEvent.changeText(screen.getByLabelText('Your full name'), 'Wade Kellner');
    fireEvent.press(screen.getByRole('checkbox', { name: 'I have read the cautions shown with these terms' }));
    expect(screen.getByRole('checkbox', { name: 'I have read the cautions shown with these terms' })).toBeChecked();
    fireEvent.press(screen.getByRole('button', { name: 'Sign the contract' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalledTimes(1));
    const [, init] = fetchMock.mock.calls[0];
    expect(JSON.parse(String(init!.body))).toEqual({ typedName: 'Wade Kellner', cautionsAcknowledged: true, termsHash: TERMS_HASH });
    queryClient.clear();
  });

  it('When the terms changed while he read them (409), then the panel says so instead of signing', async () => {
    global.fetch = routeFetch({
      [`POST /api/contracts/${toSign.id}/sign`]: () => ({ status: 409, body: { error: { code: 'terms_changed', message: 'The terms changed since you opened them. Read them again and sign.' } } }),
    });
    const { queryClient } = await renderWithProviders(<ContractDetail contract={toSign} viewerId={wade.id} viewerName={wade.name} />);
    fireEvent.changeText(screen.getByLabelText('Your full name'), 'Wade Kellner');
    fireEvent.press(screen.getByRole('checkbox', { name: 'I have read the cautions shown with these terms' }));
    fireEvent.press(screen.getByRole('button', { name: 'Sign the contract' }));
    expect(await screen.findByText('The terms changed')).toBeTruthy();
    queryClient.clear();
  });

  it('When both have signed, then there is no sign panel, the grower is told the animals come next, and she may still cancel with a reason', async () => {
    const fetchMock = routeFetch({
      [`POST /api/contracts/contract-olsen-1/cancel`]: () => ({ status: 200, body: { contract: { ...contractFixture(), status: 'cancelled' } } }),
    });
    global.fetch = fetchMock;
    const signed = contractFixture({ status: 'signed' });
    const { queryClient } = await renderWithProviders(<ContractDetail contract={signed} viewerId={greta.id} viewerName={greta.name} />);
    expect(screen.queryByRole('button', { name: 'Sign the contract' })).toBeNull();
    expect(textOf('next-step')).toBe('Signed: waiting for the animals to arrive');
    expect(screen.getByTestId('signature-grazier')).toHaveTextContent(/Signed as “Wade Kellner”/);

    fireEvent.press(screen.getByRole('button', { name: 'Cancel this contract…' }));
    fireEvent.press(screen.getByRole('button', { name: 'Cancel the contract' }));
    expect(await screen.findByText('Say why the contract is cancelled')).toBeTruthy();
    fireEvent.changeText(screen.getByLabelText('Reason'), 'The block flooded; no grazing this winter.');
    fireEvent.press(screen.getByRole('button', { name: 'Cancel the contract' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalledTimes(1));
    expect(JSON.parse(String(fetchMock.mock.calls[0][1]!.body))).toEqual({ reason: 'The block flooded; no grazing this winter.' });
    queryClient.clear();
  });

  it('When she proposes a change of head count with a reason, then only the changed term and the reason are sent', async () => {
    const fetchMock = routeFetch({
      [`POST /api/contracts/contract-olsen-1/amendments`]: () => ({ status: 201, body: { contract: contractFixture({ status: 'to-sign' }) } }),
    });
    global.fetch = fetchMock;
    const { queryClient } = await renderWithProviders(<ContractDetail contract={contractFixture({ status: 'signed' })} viewerId={greta.id} viewerName={greta.name} />);
    fireEvent.press(screen.getByRole('button', { name: 'Propose a change to the terms…' }));
    fireEvent.press(screen.getByRole('button', { name: 'Propose the change' }));
    expect(await screen.findByText('Say why the terms change')).toBeTruthy();
    fireEvent.changeText(screen.getByLabelText('Why the terms change'), 'Only 500 ewes are dry this year.');
    fireEvent.press(screen.getByRole('button', { name: 'Propose the change' }));
    expect(await screen.findByText('Change at least one term: as typed, the terms stay the same')).toBeTruthy();
    fireEvent.changeText(screen.getByLabelText('Head count'), '500');
    fireEvent.press(screen.getByRole('button', { name: 'Propose the change' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalledTimes(1));
    expect(JSON.parse(String(fetchMock.mock.calls[0][1]!.body))).toEqual({ headCount: 500, reason: 'Only 500 ewes are dry this year.' });
    queryClient.clear();
  });
});
