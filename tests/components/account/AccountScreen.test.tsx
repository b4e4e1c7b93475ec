import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { AccountScreen } from '../../../components/screens/AccountScreen';
import { fakeServer } from '../sharing/fakeServer';
import { renderWithQueryClient } from '../testUtils';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children, router: { replace: jest.fn() } }));

const ME = { id: 'u1', name: 'Invented Person', email: 'invented@x.example', siteRole: 'member', emailVerified: true };
const THIS_BROWSER = { id: 'a'.repeat(32), createdAt: '2025-01-02T10:00:00.000Z', lastSeenAt: '2025-01-03T10:00:00.000Z', device: 'Firefox on Linux', current: true };
const PHONE = { id: 'b'.repeat(32), createdAt: '2025-01-01T08:00:00.000Z', lastSeenAt: '2025-01-02T08:00:00.000Z', device: 'Safari on iPhone', current: false };
const LAPTOP = { id: 'c'.repeat(32), createdAt: null, lastSeenAt: null, device: 'Edge on Windows', current: false };

function serverWith(routes: Parameters<typeof fakeServer>[0] = {}) {
  return fakeServer({
    'GET /me': { status: 200, body: { user: ME } },
    'GET /me/sessions': { status: 200, body: { sessions: [THIS_BROWSER, PHONE, LAPTOP] } },
    ...routes,
  });
}

describe('AccountScreen', () => {
  it('lists the sessions with their browsers, marks this device, and offers to end only the others', async () => {
    serverWith();
    renderWithQueryClient(<AccountScreen />);
    await waitFor(() => expect(screen.getByTestId(`session-${PHONE.id}`)).toBeTruthy());
    expect(screen.getByTestId(`session-${THIS_BROWSER.id}`)).toHaveTextContent(/Firefox on Linux.*This device/);
    expect(screen.getByTestId(`session-${PHONE.id}`)).toHaveTextContent(/Safari on iPhone/);
    // A session from before these were kept says so rather than showing a made-up time.
    expect(screen.getByTestId(`session-${LAPTOP.id}`)).toHaveTextContent(/Signed in not recorded · last seen not recorded/);
    expect(screen.queryByTestId(`session-end-${THIS_BROWSER.id}`)).toBeNull();
    expect(screen.getByTestId(`session-end-${PHONE.id}`)).toBeTruthy();
    expect(screen.getByTestId('sessions-end-others')).toBeTruthy();
  });

  it('ends one session and then all others, and says what happened', async () => {
    const server = serverWith({
      [`DELETE /me/sessions/${PHONE.id}`]: { status: 200, body: { ended: 1, message: 'That session has ended: the browser is signed out.' } },
      'POST /me/sessions/end-others': { status: 200, body: { ended: 1, message: 'Signed out everywhere else (1 session).' } },
    });
    renderWithQueryClient(<AccountScreen />);
    await waitFor(() => expect(screen.getByTestId(`session-end-${PHONE.id}`)).toBeTruthy());
    fireEvent.press(screen.getByTestId(`session-end-${PHONE.id}`));
    await waitFor(() => expect(screen.getByTestId('sessions-ended')).toHaveTextContent('That session has ended: the browser is signed out.'));
    expect(server.sent('DELETE', `/me/sessions/${PHONE.id}`)).toHaveLength(1);
    fireEvent.press(screen.getByTestId('sessions-end-others'));
    await waitFor(() => expect(screen.getByTestId('sessions-ended')).toHaveTextContent('Signed out everywhere else (1 session).'));
    expect(server.sent('POST', '/me/sessions/end-others')).toHaveLength(1);
  });

  it('checks the password form before sending, and shows the server’s answer about other sessions', async () => {
    const server = serverWith({
      'POST /me/password': { status: 200, body: { ended: 2, message: 'Password changed. You stay signed in here; 2 other sessions were signed out.' } },
    });
    renderWithQueryClient(<AccountScreen />);
    await waitFor(() => expect(screen.getByTestId('account-password-save')).toBeTruthy());
    fireEvent.press(screen.getByTestId('account-password-save'));
    // The messages of the shared schema (shared/api/account.ts, shared/api/schemas.ts).
    expect(screen.getByTestId('account-password-current-error')).toHaveTextContent('Enter your current password');
    expect(screen.getByTestId('account-password-new-error')).toHaveTextContent('Password must be at least 10 characters');
    expect(server.sent('POST', '/me/password')).toHaveLength(0);

    fireEvent.changeText(screen.getByTestId('account-password-current'), 'the-old-password');
    fireEvent.changeText(screen.getByTestId('account-password-new'), 'a-brand-new-password');
    fireEvent.press(screen.getByTestId('account-password-save'));
    await waitFor(() => expect(screen.getByTestId('account-password-changed')).toHaveTextContent('Password changed. You stay signed in here; 2 other sessions were signed out.'));
    expect(server.sent('POST', '/me/password')[0].body).toEqual({ currentPassword: 'the-old-password', newPassword: 'a-brand-new-password' });
  });

  it('shows a wrong current password at the field', async () => {
    serverWith({
      'POST /me/email': { status: 403, body: { error: { code: 'wrong_password', message: 'That is not your current password.', fields: { currentPassword: 'Not your current password' } } } },
    });
    renderWithQueryClient(<AccountScreen />);
    await waitFor(() => expect(screen.getByTestId('account-email-save')).toBeTruthy());
    fireEvent.changeText(screen.getByTestId('account-email-new'), 'new@x.example');
    fireEvent.changeText(screen.getByTestId('account-email-password'), 'not-it');
    fireEvent.press(screen.getByTestId('account-email-save'));
    await waitFor(() => expect(screen.getByTestId('account-email-password-error')).toHaveTextContent('Not your current password'));
    expect(screen.getByTestId('account-email-error')).toHaveTextContent('That is not your current password.');
  });

  it('says the address changes only once the link is opened, and keeps showing the current one', async () => {
    const server = serverWith({
      'POST /me/email': { status: 202, body: { message: 'We sent a link to new@x.example. Your address changes when you open it; until then you sign in with invented@x.example.' } },
    });
    renderWithQueryClient(<AccountScreen />);
    await waitFor(() => expect(screen.getByTestId('account-email-save')).toBeTruthy());
    fireEvent.changeText(screen.getByTestId('account-email-new'), 'new@x.example');
    fireEvent.changeText(screen.getByTestId('account-email-password'), 'the-password');
    fireEvent.press(screen.getByTestId('account-email-save'));
    await waitFor(() => expect(screen.getByTestId('account-email-sent')).toHaveTextContent(/until then you sign in with invented@x.example/));
    expect(screen.getByTestId('account-email-current')).toHaveTextContent('invented@x.example');
    expect(server.sent('POST', '/me/email')[0].body).toEqual({ email: 'new@x.example', currentPassword: 'the-password' });
  });

  it('saves a new name', async () => {
    const server = serverWith({ 'PATCH /me': { status: 200, body: { user: { ...ME, name: 'Invented Renamed' } } } });
    renderWithQueryClient(<AccountScreen />);
    await waitFor(() => expect(screen.getByTestId('account-name-field')).toBeTruthy());
    fireEvent.changeText(screen.getByTestId('account-name-field'), 'Invented Renamed');
    fireEvent.press(screen.getByTestId('account-name-save'));
    await waitFor(() => expect(screen.getByTestId('account-card')).toHaveTextContent(/Invented Renamed/));
    expect(server.sent('PATCH', '/me')[0].body).toEqual({ name: 'Invented Renamed' });
  });

  it('confirms an opened address-change link once and shows the outcome', async () => {
    const token = 'T'.repeat(43);
    const server = serverWith({
      'POST /auth/email-change/confirm': { status: 200, body: { user: { ...ME, email: 'new@x.example' }, message: 'Your address is now new@x.example. Sign in with it from now on.' } },
    });
    const settled = jest.fn();
    renderWithQueryClient(<AccountScreen confirmEmailToken={token} onConfirmSettled={settled} />);
    await waitFor(() => expect(screen.getByTestId('email-change-confirmed')).toHaveTextContent('Your address is now new@x.example. Sign in with it from now on.'));
    expect(server.sent('POST', '/auth/email-change/confirm')).toEqual([{ method: 'POST', path: '/auth/email-change/confirm', body: { token } }]);
    expect(settled).toHaveBeenCalledTimes(1);
  });
});
