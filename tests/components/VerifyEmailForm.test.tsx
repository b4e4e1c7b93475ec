import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { VerifyEmailForm } from '../../components/auth/VerifyEmailForm';
import { mockFetchOnce, renderWithQueryClient } from './testUtils';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

const TOKEN = 'T'.repeat(43);

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('VerifyEmailForm', () => {
  it('sends nothing on opening the link: the password is asked first', () => {
    renderWithQueryClient(<VerifyEmailForm token={TOKEN} onVerified={jest.fn()} />);
    expect(screen.getByTestId('verify-password')).toBeTruthy();
    fireEvent.press(screen.getByTestId('verify-submit'));
    expect(screen.getByTestId('verify-password-error')).toHaveTextContent('Password is required');
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it('sends the token with the password, and shows the server’s advice when the password is not the account’s', async () => {
    const advice = 'This link is for an account with a different password. Use "Forgot password" to set your own.';
    mockFetchOnce(400, { error: { code: 'invalid_verification_token', message: advice, fields: { password: 'Not the password of this account' } } });
    const onVerified = jest.fn();
    renderWithQueryClient(<VerifyEmailForm token={TOKEN} onVerified={onVerified} />);
    fireEvent.changeText(screen.getByTestId('verify-password'), 'someone-elses-password');
    fireEvent.press(screen.getByTestId('verify-submit'));
    await waitFor(() => expect(screen.getByTestId('verify-error')).toHaveTextContent(advice));
    expect(screen.getByTestId('verify-password-error')).toHaveTextContent('Not the password of this account');
    expect(screen.getByText(/Forgot the password/)).toBeTruthy();
    expect(onVerified).not.toHaveBeenCalled();
    const [url, init] = (global.fetch as jest.Mock).mock.calls[0];
    expect(url).toBe('/api/auth/verify');
    expect(JSON.parse(init.body)).toEqual({ token: TOKEN, password: 'someone-elses-password' });
  });

  it('calls back once the address is confirmed', async () => {
    mockFetchOnce(200, { user: { id: 'u1', name: 'Invented', email: 'a@b.example', siteRole: 'member', emailVerified: true } });
    const onVerified = jest.fn();
    renderWithQueryClient(<VerifyEmailForm token={TOKEN} onVerified={onVerified} />);
    fireEvent.changeText(screen.getByTestId('verify-password'), 'the-right-password');
    fireEvent.press(screen.getByTestId('verify-submit'));
    await waitFor(() => expect(onVerified).toHaveBeenCalledTimes(1));
  });

  it('says so when the link has no token', () => {
    renderWithQueryClient(<VerifyEmailForm token="" onVerified={jest.fn()} />);
    expect(screen.getByTestId('verify-error')).toHaveTextContent(/incomplete/);
    expect(screen.queryByTestId('verify-password')).toBeNull();
  });
});
