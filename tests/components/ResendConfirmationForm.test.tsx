import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { ResendConfirmationForm } from '../../components/auth/ResendConfirmationForm';
import { mockFetchOnce, renderWithQueryClient } from './testUtils';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('ResendConfirmationForm', () => {
  it('points out a malformed e-mail without asking the server', () => {
    renderWithQueryClient(<ResendConfirmationForm />);
    fireEvent.changeText(screen.getByTestId('resend-email'), 'not-an-email');
    fireEvent.press(screen.getByTestId('resend-submit'));
    expect(screen.getByTestId('resend-email-error')).toHaveTextContent('Enter a valid e-mail address');
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it('posts the address to the public resend route and shows the server’s reply', async () => {
    const reply = 'If an account with this e-mail is waiting for confirmation, a new link is on its way. It works for 24 hours.';
    mockFetchOnce(202, { message: reply });
    renderWithQueryClient(<ResendConfirmationForm />);
    fireEvent.changeText(screen.getByTestId('resend-email'), 'newcomer@test.rungbook.example');
    fireEvent.press(screen.getByTestId('resend-submit'));
    await waitFor(() => expect(screen.getByTestId('resend-sent')).toHaveTextContent(reply));
    const [url, init] = (global.fetch as jest.Mock).mock.calls[0];
    expect(url).toBe('/api/auth/verify/resend');
    expect(init.method).toBe('POST');
    expect(JSON.parse(init.body)).toEqual({ email: 'newcomer@test.rungbook.example' });
  });

  it('shows a rate limit as an error, not as sent', async () => {
    mockFetchOnce(429, { error: { code: 'rate_limited', message: 'Several confirmation e-mails were sent to this address in the last hour.' } });
    renderWithQueryClient(<ResendConfirmationForm />);
    fireEvent.changeText(screen.getByTestId('resend-email'), 'newcomer@test.rungbook.example');
    fireEvent.press(screen.getByTestId('resend-submit'));
    await waitFor(() => expect(screen.getByTestId('resend-error')).toHaveTextContent(/^Several confirmation e-mails/));
    expect(screen.queryByTestId('resend-sent')).toBeNull();
  });
});
