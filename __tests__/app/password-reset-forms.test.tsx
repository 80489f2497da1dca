import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { ForgotPasswordForm } from '@/components/shell/forgot-password-form';
import { ResetPasswordForm } from '@/components/shell/reset-password-form';
import { renderWithProviders } from '../helpers/render-app';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

const TOKEN = 'AbCdEfGhIjKlMnOpQrStUvWxYz0123456789_-AbCdE';
const fetchMock = jest.fn();
beforeEach(() => {
  fetchMock.mockReset();
  global.fetch = fetchMock as unknown as typeof fetch;
});

const answer = (status: number, body?: unknown) => ({ ok: status < 400, status, json: async () => body });

describe('ForgotPasswordForm', () => {
  it('sends the email in lower case and shows the server’s words as sent, whatever account there is', async () => {
    fetchMock.mockResolvedValue(answer(202, { message: 'If an account uses this email, a link to set a new password is on its way. It works for 30 minutes.' }));
    const { queryClient } = await renderWithProviders(<ForgotPasswordForm />);
    fireEvent.changeText(screen.getByLabelText('Email'), 'Rosa@Orchard.example');
    fireEvent.press(screen.getByRole('button', { name: 'Mail me a link' }));
    expect(await screen.findByText('Check your mail')).toBeTruthy();
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/auth/password-reset');
    expect(JSON.parse(init.body)).toEqual({ email: 'rosa@orchard.example' });
    expect(screen.getByRole('button', { name: 'Send the link again' })).toBeTruthy();
    queryClient.clear();
  });
});

describe('ResetPasswordForm', () => {
  it('refuses a password over 72 bytes before sending, then sends the token with the new password and says to sign in', async () => {
    fetchMock.mockResolvedValue(answer(204));
    const { queryClient } = await renderWithProviders(<ResetPasswordForm token={TOKEN} />);
    fireEvent.changeText(screen.getByLabelText('New password'), '🐑'.repeat(19));
    fireEvent.press(screen.getByRole('button', { name: 'Set new password' }));
    expect(await screen.findByText(/at most 72 bytes/)).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();

    fireEvent.changeText(screen.getByLabelText('New password'), 'a-fresh-walnut-password');
    fireEvent.press(screen.getByRole('button', { name: 'Set new password' }));
    expect(await screen.findByText('Password set')).toBeTruthy();
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/auth/password-reset/confirm');
    expect(JSON.parse(init.body)).toEqual({ token: TOKEN, password: 'a-fresh-walnut-password' });
    queryClient.clear();
  });

  it('shows a used link once, in its own notice', async () => {
    const message = 'This reset link has been used already: ask for a new one if you need it';
    fetchMock.mockResolvedValue(answer(410, { error: { code: 'token_used_or_expired', message, fields: { token: message } } }));
    const { queryClient } = await renderWithProviders(<ResetPasswordForm token={TOKEN} />);
    fireEvent.changeText(screen.getByLabelText('New password'), 'a-fresh-walnut-password');
    fireEvent.press(screen.getByRole('button', { name: 'Set new password' }));
    expect(await screen.findByText('This link does not work')).toBeTruthy();
    await waitFor(() => expect(screen.getAllByText(message)).toHaveLength(1));
    queryClient.clear();
  });

  it('without a token in the link, says so instead of sending', async () => {
    const { queryClient } = await renderWithProviders(<ResetPasswordForm token="" />);
    fireEvent.changeText(screen.getByLabelText('New password'), 'a-fresh-walnut-password');
    fireEvent.press(screen.getByRole('button', { name: 'Set new password' }));
    expect(await screen.findByText(/needs the link from the mail/)).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
    queryClient.clear();
  });
});
