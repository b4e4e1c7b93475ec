import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { SignUpForm } from '../../components/auth/SignUpForm';
import { mockFetchOnce, renderWithQueryClient } from './testUtils';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('SignUpForm', () => {
  it('asks for a 10-character password before sending anything', () => {
    renderWithQueryClient(<SignUpForm onSignedUp={jest.fn()} />);
    fireEvent.changeText(screen.getByTestId('sign-up-name'), 'Invented Person');
    fireEvent.changeText(screen.getByTestId('sign-up-email'), 'x@y.example');
    fireEvent.changeText(screen.getByTestId('sign-up-password'), 'short');
    fireEvent.press(screen.getByTestId('sign-up-submit'));
    expect(screen.getByTestId('sign-up-password-error')).toHaveTextContent('Password must be at least 10 characters');
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it('shows a duplicate e-mail next to the e-mail field', async () => {
    mockFetchOnce(409, {
      error: { code: 'email_taken', message: 'An account with this e-mail already exists.', fields: { email: 'This e-mail is already registered' } },
    });
    renderWithQueryClient(<SignUpForm onSignedUp={jest.fn()} />);
    fireEvent.changeText(screen.getByTestId('sign-up-name'), 'Invented Person');
    fireEvent.changeText(screen.getByTestId('sign-up-email'), 'taken@y.example');
    fireEvent.changeText(screen.getByTestId('sign-up-password'), 'long-enough-password');
    fireEvent.press(screen.getByTestId('sign-up-submit'));
    await waitFor(() => expect(screen.getByTestId('sign-up-email-error')).toHaveTextContent('This e-mail is already registered'));
    expect(screen.getByTestId('sign-up-error')).toHaveTextContent(/already exists/);
  });
});
