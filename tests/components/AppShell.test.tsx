import { screen } from '@testing-library/react-native';
import { Text, useWindowDimensions } from 'react-native';
import { AppShell } from '../../components/navigation/AppShell';
import { renderWithQueryClient } from './testUtils';

let mockPathname = '/groups';
jest.mock('expo-router', () => ({ usePathname: () => mockPathname, router: { navigate: jest.fn() } }));
jest.mock('react-native/Libraries/Utilities/useWindowDimensions', () => ({ __esModule: true, default: jest.fn() }));

const member = { id: 'u1', name: 'Invented Member', email: 'm@x.example', siteRole: 'member' as const, emailVerified: true };
const admin = { ...member, siteRole: 'admin' as const };

function atWidth(width: number) {
  (useWindowDimensions as jest.Mock).mockReturnValue({ width, height: 900, scale: 1, fontScale: 1 });
}

describe('AppShell navigation', () => {
  it('puts the destinations in a bottom bar on a phone (390 px)', () => {
    atWidth(390);
    renderWithQueryClient(<AppShell user={member}><Text>body</Text></AppShell>);
    expect(screen.getByTestId('bottom-bar')).toBeTruthy();
    expect(screen.queryByTestId('side-rail')).toBeNull();
    expect(screen.getByTestId('nav-groups')).toHaveProp('accessibilityState', { selected: true });
  });

  it('switches to a side rail from 1024 px', () => {
    atWidth(1024);
    renderWithQueryClient(<AppShell user={member}><Text>body</Text></AppShell>);
    expect(screen.getByTestId('side-rail')).toBeTruthy();
    expect(screen.queryByTestId('bottom-bar')).toBeNull();
  });

  it('leaves the whole screen to the presentation view', () => {
    atWidth(1440);
    mockPathname = '/notebooks/abc/present';
    renderWithQueryClient(<AppShell user={member}><Text>slide</Text></AppShell>);
    expect(screen.queryByTestId('side-rail')).toBeNull();
    expect(screen.queryByTestId('bottom-bar')).toBeNull();
    expect(screen.getByText('slide')).toBeTruthy();
    mockPathname = '/groups';
  });

  it('shows the mail capture only to site admins', () => {
    atWidth(1440);
    const { unmount } = renderWithQueryClient(<AppShell user={member}><Text>body</Text></AppShell>);
    expect(screen.queryByTestId('nav-mail')).toBeNull();
    unmount();
    renderWithQueryClient(<AppShell user={admin}><Text>body</Text></AppShell>);
    expect(screen.getByTestId('nav-mail')).toBeTruthy();
  });
});
