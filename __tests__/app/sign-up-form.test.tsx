import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { SignUpForm } from '@/components/shell/sign-up-form';
import { renderWithProviders } from '../helpers/render-app';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

const fetchMock = jest.fn();
beforeEach(() => {
  fetchMock.mockReset();
  global.fetch = fetchMock as unknown as typeof fetch;
});

describe('SignUpForm', () => {
  it('shows the shared schema messages beside the fields and sends nothing when the form is empty', async () => {
    const { queryClient } = await renderWithProviders(<SignUpForm />);
    fireEvent.press(screen.getByRole('button', { name: 'Create account' }));
    expect(await screen.findByText('Email is required')).toBeTruthy();
    expect(screen.getByText('Password is required')).toBeTruthy();
    expect(screen.getByText('Name is required')).toBeTruthy();
    expect(screen.getByText('Choose at least one role: grower or grazier')).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
    queryClient.clear();
  });

  it('puts the server message for a taken email beside the email field', async () => {
    fetchMock.mockResolvedValue({
      ok: false,
      status: 409,
      json: async () => ({ error: { code: 'email_taken', message: 'An account with this email already exists. Sign in instead.', fields: { email: 'This email already has an account' } } }),
    });
    const { queryClient } = await renderWithProviders(<SignUpForm />);
    fireEvent.changeText(screen.getByLabelText('Your name'), 'Pia Lindqvist');
    fireEvent.changeText(screen.getByLabelText('Email'), 'pia@orchard.example');
    fireEvent.changeText(screen.getByLabelText('Password'), 'a-long-orchard-password');
    fireEvent.press(screen.getByRole('checkbox', { name: 'I have land to graze' }));
    fireEvent.press(screen.getByRole('button', { name: 'Create account' }));
    expect(await screen.findByText('This email already has an account')).toBeTruthy();
    expect(screen.getByText('An account with this email already exists. Sign in instead.')).toBeTruthy();
    await waitFor(() => expect(fetchMock).toHaveBeenCalledTimes(1));
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/auth/register');
    expect(JSON.parse(init.body)).toEqual({ name: 'Pia Lindqvist', email: 'pia@orchard.example', password: 'a-long-orchard-password', roles: ['grower'] });
    queryClient.clear();
  });

  it('refuses a password longer than bcrypt reads (72 UTF-8 bytes) before anything is sent', async () => {
    const { queryClient } = await renderWithProviders(<SignUpForm />);
    fireEvent.changeText(screen.getByLabelText('Your name'), 'Jürgen Müller');
    fireEvent.changeText(screen.getByLabelText('Email'), 'juergen@orchard.example');
    fireEvent.changeText(screen.getByLabelText('Password'), 'ü'.repeat(37));
    fireEvent.press(screen.getByRole('checkbox', { name: 'I have land to graze' }));
    fireEvent.press(screen.getByRole('button', { name: 'Create account' }));
    expect(await screen.findByText('Password must be at most 72 bytes: 72 plain letters, fewer with accents or emoji')).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
    queryClient.clear();
  });
});
