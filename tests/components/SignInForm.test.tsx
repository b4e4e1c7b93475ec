import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import SignInRoute from '../../app/(auth)/sign-in';
import { SignInForm } from '../../components/auth/SignInForm';
import { mockFetchOnce, renderWithQueryClient } from './testUtils';

// Links render as a View carrying their target, so a test can see where they lead.
jest.mock('expo-router', () => {
  const { createElement } = require('react');
  const { View } = require('react-native');
  return {
    Link: ({ children, href, testID }: { children: unknown; href: string; testID?: string }) => createElement(View, { testID, accessibilityHint: href }, children),
    router: { replace: jest.fn() },
    useLocalSearchParams: jest.fn(() => ({})),
  };
});
const expoRouter = jest.requireMock<{ router: { replace: jest.Mock }; useLocalSearchParams: jest.Mock }>('expo-router');

beforeEach(() => {
  global.fetch = jest.fn();
});

describe('SignInForm', () => {
  it('points out a malformed e-mail without asking the server', () => {
    renderWithQueryClient(<SignInForm onSignedIn={jest.fn()} />);
    fireEvent.changeText(screen.getByTestId('sign-in-email'), 'not-an-email');
    fireEvent.changeText(screen.getByTestId('sign-in-password'), 'something');
    fireEvent.press(screen.getByTestId('sign-in-submit'));
    expect(screen.getByTestId('sign-in-email-error')).toHaveTextContent('Enter a valid e-mail address');
    expect(global.fetch).not.toHaveBeenCalled();
  });

  it("shows the server's message for a wrong password and stays on the form", async () => {
    mockFetchOnce(401, { error: { code: 'wrong_credentials', message: 'E-mail or password is not correct.' } });
    const onSignedIn = jest.fn();
    renderWithQueryClient(<SignInForm onSignedIn={onSignedIn} />);
    fireEvent.changeText(screen.getByTestId('sign-in-email'), 'lead@demo.rungbook.example');
    fireEvent.changeText(screen.getByTestId('sign-in-password'), 'wrong-password');
    fireEvent.press(screen.getByTestId('sign-in-submit'));
    await waitFor(() => expect(screen.getByTestId('sign-in-error')).toHaveTextContent('E-mail or password is not correct.'));
    expect(onSignedIn).not.toHaveBeenCalled();
    const [url, init] = (global.fetch as jest.Mock).mock.calls[0];
    expect(url).toBe('/api/auth/sign-in');
    expect(JSON.parse(init.body)).toEqual({ email: 'lead@demo.rungbook.example', password: 'wrong-password' });
  });

  it('calls back once signed in', async () => {
    mockFetchOnce(200, { user: { id: 'u1', name: 'Invented', email: 'a@b.example', siteRole: 'member', emailVerified: true } });
    const onSignedIn = jest.fn();
    renderWithQueryClient(<SignInForm onSignedIn={onSignedIn} />);
    fireEvent.changeText(screen.getByTestId('sign-in-email'), 'a@b.example');
    fireEvent.changeText(screen.getByTestId('sign-in-password'), 'right-password');
    fireEvent.press(screen.getByTestId('sign-in-submit'));
    await waitFor(() => expect(onSignedIn).toHaveBeenCalledTimes(1));
  });

  it('offers a new confirmation e-mail to people whose account is not confirmed yet (they cannot sign in until it is)', () => {
    renderWithQueryClient(<SignInForm onSignedIn={jest.fn()} />);
    const link = screen.getByTestId('to-resend');
    expect(link.props.accessibilityHint).toBe('/resend-confirmation');
    expect(link).toHaveTextContent('Not confirmed yet? Resend the confirmation e-mail');
  });
});

describe('the sign-in page', () => {
  const user = { id: 'u1', name: 'Invented', email: 'a@b.example', siteRole: 'member', emailVerified: true };

  async function signInWith(next: string | undefined): Promise<string> {
    expoRouter.router.replace.mockClear();
    expoRouter.useLocalSearchParams.mockReturnValue(next === undefined ? {} : { next });
    mockFetchOnce(200, { user });
    const view = renderWithQueryClient(<SignInRoute />);
    fireEvent.changeText(screen.getByTestId('sign-in-email'), 'a@b.example');
    fireEvent.changeText(screen.getByTestId('sign-in-password'), 'right-password');
    fireEvent.press(screen.getByTestId('sign-in-submit'));
    await waitFor(() => expect(expoRouter.router.replace).toHaveBeenCalledTimes(1));
    view.unmount();
    return expoRouter.router.replace.mock.calls[0][0];
  }

  it('goes back to the page named by next= when it is a path of this site', async () => {
    expect(await signInWith('/shared/Abcdefghijklmnopqrstuvwxyz0123456789_-ABCDE')).toBe('/shared/Abcdefghijklmnopqrstuvwxyz0123456789_-ABCDE');
  });

  it('goes to the notebooks without next=', async () => {
    expect(await signInWith(undefined)).toBe('/notebooks');
  });

  // '//host' and '/\\host' are read by browsers as another site; a scheme is another site outright.
  it.each(['//evil.example', 'https://evil.example', '/\\evil.example', 'javascript:alert(1)', 'shared/x', '/\t/evil.example'])('ignores next=%j and goes to the notebooks', async (next) => {
    expect(await signInWith(next)).toBe('/notebooks');
  });
});
