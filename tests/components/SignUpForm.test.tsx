import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { SignUpForm } from '../../components/auth/SignUpForm';
import { queryKeys } from '../../hooks/api/keys';
import { mockFetchOnce, renderWithQueryClient } from './testUtils';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

beforeEach(() => {
  global.fetch = jest.fn();
});

function fillIn(email: string, password: string) {
  fireEvent.changeText(screen.getByTestId('sign-up-name'), 'Invented Person');
  fireEvent.changeText(screen.getByTestId('sign-up-email'), email);
  fireEvent.changeText(screen.getByTestId('sign-up-password'), password);
  fireEvent.press(screen.getByTestId('sign-up-submit'));
}

describe('SignUpForm', () => {
  it('asks for a 10-character password before sending anything', () => {
    renderWithQueryClient(<SignUpForm />);
    fillIn('x@y.example', 'short');
    expect(screen.getByTestId('sign-up-password-error')).toHaveTextContent('Password must be at least 10 characters');
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it('after sending, shows the server’s "check your inbox" message instead of the form and signs nobody in', async () => {
    const message = 'Almost done: we sent a message to new@y.example. Follow its link to confirm the address and sign in.';
    mockFetchOnce(202, { message });
    const { client } = renderWithQueryClient(<SignUpForm />);
    fillIn('new@y.example', 'long-enough-password');
    await waitFor(() => expect(screen.getByTestId('sign-up-sent')).toHaveTextContent(message));
    expect(screen.queryByTestId('sign-up-submit')).toBeNull();
    expect(client.getQueryData(queryKeys.me)).toBeUndefined();
    const [url, init] = (global.fetch as jest.Mock).mock.calls[0];
    expect(String(url)).toMatch(/\/api\/auth\/sign-up$/);
    expect(JSON.parse(init.body)).toEqual({ name: 'Invented Person', email: 'new@y.example', password: 'long-enough-password' });
  });

  it('shows a server refusal (e.g. the sign-up rate limit) above the form and keeps the input', async () => {
    mockFetchOnce(429, { error: { code: 'rate_limited', message: 'Too many sign-ups from this network. Wait a few minutes.' } });
    renderWithQueryClient(<SignUpForm />);
    fillIn('x@y.example', 'long-enough-password');
    await waitFor(() => expect(screen.getByTestId('sign-up-error')).toHaveTextContent(/Too many sign-ups/));
    expect(screen.getByTestId('sign-up-submit')).toBeTruthy();
  });
});
