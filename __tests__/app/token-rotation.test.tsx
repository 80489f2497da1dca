import { act } from '@testing-library/react-native';
import { Text } from 'react-native';
import { tokenStorage } from '@/hooks/auth/token-storage';
import { useSession } from '@/hooks/auth/session';
import { rotationDueAt } from '@/hooks/auth/token-rotation';
import { renderWithProviders } from '../helpers/render-app';
import { greta, routeFetch } from '../helpers/contract-fixtures';

// The app trades its token for a new one once it is past half its life (POST /api/auth/refresh).

const NOW = Date.parse('2027-01-22T16:00:00Z');
const DAY_S = 86_400;

/** A token shaped like the server's (header.claims.signature, base64url); the app reads only iat and exp. */
function token(claims: Record<string, unknown>, signature = 'sig'): string {
  const part = (o: object) => Buffer.from(JSON.stringify(o)).toString('base64url');
  return `${part({ alg: 'HS256', typ: 'JWT' })}.${part({ sub: greta.id, sid: 's-1', ...claims })}.${signature}`;
}

const nowS = NOW / 1000;
const oldToken = token({ iat: nowS - 5 * DAY_S, exp: nowS + 2 * DAY_S }); // 7-day token, 5 days in
const newToken = token({ iat: nowS, exp: nowS + 7 * DAY_S }, 'fresh');

function Probe() {
  const { status, token: t } = useSession();
  return <Text testID="session">{`${status} ${t}`}</Text>;
}

async function settle(times = 5) {
  for (let i = 0; i < times; i++) {
    await act(async () => {
      await new Promise((r) => setTimeout(r, 10));
    });
  }
}

beforeEach(() => {
  jest.spyOn(Date, 'now').mockReturnValue(NOW);
});
afterEach(async () => {
  jest.restoreAllMocks();
  await tokenStorage.set(null);
});

describe('rotationDueAt', () => {
  it('When a token carries iat and exp, then rotation is due half-way between them; an unreadable token has no time', () => {
    expect(rotationDueAt(oldToken)).toBe((nowS - 5 * DAY_S + (nowS + 2 * DAY_S)) * 500);
    expect(rotationDueAt(token({ iat: 1000 }))).toBeNull();
    expect(rotationDueAt('not-a-token')).toBeNull();
    expect(rotationDueAt('a.%%%.c')).toBeNull();
  });
});

describe('Rotating the session token', () => {
  it('When the kept token is past half its life, then the app refreshes it at once and keeps the new token', async () => {
    const refreshedWith: string[] = [];
    global.fetch = routeFetch({
      'GET /api/me': () => ({ status: 200, body: { user: greta } }),
      'POST /api/auth/refresh': (init) => {
        refreshedWith.push(String((init?.headers as Record<string, string>).Authorization));
        return { status: 200, body: { token: newToken, user: greta } };
      },
    }) as unknown as typeof fetch;
    await tokenStorage.set(oldToken);
    const view = await renderWithProviders(<Probe />);
    await settle();
    expect(refreshedWith).toEqual([`Bearer ${oldToken}`]);
    expect(await tokenStorage.get()).toBe(newToken);
    expect(view.getByTestId('session').props.children).toBe(`signed-in ${newToken}`);
  });

  it('When the token is young, then nothing is refreshed', async () => {
    const young = token({ iat: nowS - DAY_S, exp: nowS + 6 * DAY_S });
    const fetchMock = routeFetch({ 'GET /api/me': () => ({ status: 200, body: { user: greta } }) });
    global.fetch = fetchMock as unknown as typeof fetch;
    await tokenStorage.set(young);
    await renderWithProviders(<Probe />);
    await settle();
    expect(fetchMock.mock.calls.map((c) => String(c[0]))).toEqual(['/api/me']);
    expect(await tokenStorage.get()).toBe(young);
  });

  it('When the refresh cannot reach the server, then the session stays signed in with its token', async () => {
    global.fetch = routeFetch({
      'GET /api/me': () => ({ status: 200, body: { user: greta } }),
      'POST /api/auth/refresh': () => {
        throw new TypeError('Network request failed');
      },
    }) as unknown as typeof fetch;
    await tokenStorage.set(oldToken);
    const view = await renderWithProviders(<Probe />);
    await settle();
    expect(await tokenStorage.get()).toBe(oldToken);
    expect(view.getByTestId('session').props.children).toBe(`signed-in ${oldToken}`);
  });

  it('When the server says the session is gone (401), then the app signs out', async () => {
    global.fetch = routeFetch({
      'GET /api/me': () => ({ status: 200, body: { user: greta } }),
      'POST /api/auth/refresh': () => ({ status: 401, body: { error: { code: 'unauthenticated', message: 'You have been signed out. Sign in again.' } } }),
    }) as unknown as typeof fetch;
    await tokenStorage.set(oldToken);
    const view = await renderWithProviders(<Probe />);
    await settle();
    expect(await tokenStorage.get()).toBeNull();
    expect(view.getByTestId('session').props.children).toBe('signed-out null');
  });
});
