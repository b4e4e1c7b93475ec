import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { Text, useWindowDimensions } from 'react-native';
import { router } from 'expo-router';
import { NotebookActivity } from '../../../components/activity/NotebookActivity';
import { AppShell } from '../../../components/navigation/AppShell';
import { ActivityScreen } from '../../../components/screens/ActivityScreen';
import type { NotificationView } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';
import { fakeApi } from './fakeApi';

jest.mock('expo-router', () => ({ usePathname: () => '/notebooks', router: { navigate: jest.fn(), push: jest.fn() } }));
jest.mock('react-native/Libraries/Utilities/useWindowDimensions', () => ({ __esModule: true, default: jest.fn() }));

const member = { id: 'u000000001', name: 'Invented Member', email: 'm@x.example', siteRole: 'member' as const, emailVerified: true };

function item(overrides: Partial<NotificationView>): NotificationView {
  return { id: 'n000000001', kind: 'mention', notebookId: 'nb00000001', notebookTitle: 'Two-loop check', actorName: 'Imre Sample', text: 'Imre Sample mentioned you in "Two-loop check"', commentId: 'cmt0000001', cellId: null, createdAt: '2026-11-30T10:00:00.000Z', read: false, ...overrides };
}

describe('unread badge on the navigation', () => {
  it.each([390, 1280])('shows the unread count from the activity reply at %i px', async (width) => {
    (useWindowDimensions as jest.Mock).mockReturnValue({ width, height: 900, scale: 1, fontScale: 1 });
    fakeApi({ 'GET /api/activity': { status: 200, body: { items: [], unread: 7 } } });
    renderWithQueryClient(<AppShell user={member}><Text>body</Text></AppShell>);
    expect(await screen.findByTestId('nav-activity-badge')).toHaveTextContent('7');
    expect(screen.getByTestId('nav-activity')).toBeTruthy();
  });

  it('shows no badge when nothing is unread', async () => {
    (useWindowDimensions as jest.Mock).mockReturnValue({ width: 390, height: 900, scale: 1, fontScale: 1 });
    const fetchMock = fakeApi({ 'GET /api/activity': { status: 200, body: { items: [item({ read: true })], unread: 0 } } });
    const { client } = renderWithQueryClient(<AppShell user={member}><Text>body</Text></AppShell>);
    await waitFor(() => expect(fetchMock).toHaveBeenCalledWith('/api/activity', expect.anything()));
    await waitFor(() => expect(client.isFetching()).toBe(0));
    expect(screen.queryByTestId('nav-activity-badge')).toBeNull();
  });
});

describe('ActivityScreen', () => {
  it('lists items newest first, marks the unread ones and leads to the cell', async () => {
    const older = item({ id: 'n000000001', read: true, createdAt: '2026-11-29T10:00:00.000Z', text: 'older' });
    const newer = item({ id: 'n000000002', cellId: 'cell000001', createdAt: '2026-11-30T10:00:00.000Z', text: 'newer' });
    const read = jest.fn(() => ({ status: 204 }));
    fakeApi({ 'GET /api/activity': { status: 200, body: { items: [older, newer], unread: 1 } }, 'POST /api/activity/read': read });
    renderWithQueryClient(<ActivityScreen />);
    await screen.findByTestId('activity-item-n000000002');
    const order = screen.getAllByTestId(/^activity-item-n\d+$/).map((node) => node.props.testID);
    expect(order).toEqual(['activity-item-n000000002', 'activity-item-n000000001']);
    expect(screen.getByTestId('activity-item-n000000002-unread')).toBeTruthy();
    expect(screen.queryByTestId('activity-item-n000000001-unread')).toBeNull();

    fireEvent.press(screen.getByTestId('activity-item-n000000002'));
    expect(router.push).toHaveBeenCalledWith('/notebooks/nb00000001?cell=cell000001');
    await waitFor(() => expect(read).toHaveBeenCalledTimes(1));
    const readCall = (global.fetch as jest.Mock).mock.calls.find(([url]) => url === '/api/activity/read');
    expect(JSON.parse(String(readCall[1].body))).toEqual({ ids: ['n000000002'] });
  });

  it('marks everything read with one press', async () => {
    const read = jest.fn(() => ({ status: 204 }));
    fakeApi({ 'GET /api/activity': { status: 200, body: { items: [item({})], unread: 1 } }, 'POST /api/activity/read': read });
    renderWithQueryClient(<ActivityScreen />);
    fireEvent.press(await screen.findByTestId('activity-mark-all-read'));
    await waitFor(() => expect(read).toHaveBeenCalledTimes(1));
    const readCall = (global.fetch as jest.Mock).mock.calls.find(([url]) => url === '/api/activity/read');
    expect(JSON.parse(String(readCall[1].body))).toEqual({});
  });
});

describe('NotebookActivity', () => {
  it('asks the server for one kind of event and one person', async () => {
    const events = [
      { id: 'ev00000001', kind: 'cell-run', actorId: 'u000000002', actorName: 'Imre Sample', text: 'ran flow', cellId: 'cell000001', createdAt: '2026-11-30T10:00:00.000Z' },
      { id: 'ev00000002', kind: 'comment-added', actorId: 'u000000003', actorName: 'Sunniva Sample', text: 'commented on flow', cellId: 'cell000001', createdAt: '2026-11-30T09:00:00.000Z' },
    ];
    const fetchMock = fakeApi({ 'GET /api/notebooks/nb00000001/activity': { status: 200, body: { events } } });
    renderWithQueryClient(<NotebookActivity notebookId="nb00000001" />);
    expect(await screen.findByTestId('notebook-activity-event-ev00000001')).toHaveTextContent(/^Imre Sample ran flow/);
    fireEvent.press(screen.getByTestId('notebook-activity-kind'));
    fireEvent.press(screen.getByTestId('notebook-activity-kind-cell-run'));
    await waitFor(() => expect(fetchMock).toHaveBeenCalledWith('/api/notebooks/nb00000001/activity?kind=cell-run', expect.anything()));
    fireEvent.press(screen.getByTestId('notebook-activity-person'));
    fireEvent.press(screen.getByTestId('notebook-activity-person-u000000003'));
    await waitFor(() => expect(fetchMock).toHaveBeenCalledWith('/api/notebooks/nb00000001/activity?kind=cell-run&actorId=u000000003', expect.anything()));
  });

  it('follows the notebook and shows that it does', async () => {
    const follow = jest.fn(() => ({ status: 200, body: { following: true } }));
    fakeApi({
      'GET /api/notebooks/nb00000001/activity': { status: 200, body: { events: [] } },
      'GET /api/notebooks/nb00000001/follow': { status: 200, body: { following: false } },
      'POST /api/notebooks/nb00000001/follow': follow,
    });
    renderWithQueryClient(<NotebookActivity notebookId="nb00000001" />);
    fireEvent.press(await screen.findByText('Follow'));
    await waitFor(() => expect(screen.getByTestId('notebook-follow')).toHaveTextContent('Following ✓'));
    expect(follow).toHaveBeenCalledTimes(1);
  });
});
