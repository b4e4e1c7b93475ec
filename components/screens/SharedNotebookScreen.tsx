import { useRef, useState, type ReactNode, type RefObject } from 'react';
import { Link } from 'expo-router';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';
import { useNotebookLive } from '../../hooks/api/live';
import { isUnknownLink, useSharedNotebookQuery } from '../../hooks/api/sharing';
import { useWideLayout } from '../../hooks/useWideLayout';
import type { NotebookDetail } from '../../shared/notebook';
import { shareTokenParam, type NotebookRole } from '../../shared/notebook/sharing';
import { AuthLink } from '../auth/AuthLink';
import { NotebookComments } from '../comments';
import { LiveStatus } from '../live/LiveStatus';
import { PresenterBar } from '../live/PresenterBar';
import { useFollowPresenter } from '../live/useFollowPresenter';
import { RungMark } from '../navigation/RungMark';
import { signInHref, sharedPagePath } from '../sharing/paths';
import { ReadOnlyCell } from '../sharing/ReadOnlyCell';
import { RoleBadge } from '../sharing/RoleBadge';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';

export const UNKNOWN_LINK_MESSAGE = 'This link does not open anything (it may have expired or been revoked).';

/** The page a share link opens, signed in or not: the notebook read-only, nothing that would be refused. */
export function SharedNotebookScreen({ token }: { token: string }) {
  const wellFormed = shareTokenParam.safeParse(token).success;
  const shared = useSharedNotebookQuery(token, wellFormed);
  const me = useMeQuery();
  const signedIn = Boolean(me.data);
  const wide = useWideLayout();
  const scroll = useRef<ScrollView>(null);
  const column = useRef<View>(null);
  if (!wellFormed || isUnknownLink(shared.error)) return <SharedFrame signedIn={signedIn} token={token}><UnknownLink /></SharedFrame>;
  if (shared.isError) return <SharedFrame signedIn={signedIn} token={token}><Notice tone="error" message={shared.error.message} testID="shared-error" /></SharedFrame>;
  if (!shared.data) return <SharedFrame signedIn={signedIn} token={token}><Text style={styles.muted}>Opening the notebook…</Text></SharedFrame>;
  return <LiveSharedNotebook notebook={shared.data} signedIn={signedIn} myId={me.data?.id} wide={wide} token={token} scroll={scroll} column={column} />;
}

const UnknownLink = () => <Notice tone="info" message={UNKNOWN_LINK_MESSAGE} testID="shared-unknown" />;

interface LiveSharedNotebookProps {
  notebook: NotebookDetail;
  signedIn: boolean;
  myId: string | undefined;
  wide: boolean;
  token: string;
  scroll: RefObject<ScrollView | null>;
  column: RefObject<View | null>;
}

/** The notebook kept current by the link's event stream; a presenter can be followed from here too. */
function LiveSharedNotebook({ notebook, signedIn, myId, wide, token, scroll, column }: LiveSharedNotebookProps) {
  const live = useNotebookLive(notebook.id, { shareToken: token });
  const cells = useRef(new Map<string, View>());
  const [highlightedId, setHighlightedId] = useState<string | null>(null);
  const reveal = (cellId: string) => {
    setHighlightedId(cellId);
    const target = cells.current.get(cellId);
    if (!target || !column.current) return;
    target.measureLayout(column.current, (_x, y) => scroll.current?.scrollTo({ y: Math.max(0, y - spacing.lg), animated: true }), () => undefined);
  };
  const follow = useFollowPresenter(live.presenter, myId, reveal);
  if (live.connection === 'revoked') return <SharedFrame signedIn={signedIn} token={token}><UnknownLink /></SharedFrame>;
  const presenterCell = follow.presenter ? notebook.cells.find((cell) => cell.id === follow.presenter?.cellId) ?? null : null;
  const following = follow.following ? { cellId: presenterCell?.id ?? null, name: follow.presenter?.name ?? '' } : null;
  return (
    <SharedFrame signedIn={signedIn} token={token} scroll={scroll} column={column} bar={<PresenterBar follow={follow} cellLabel={presenterCell?.label ?? null} />}>
      <SharedNotebook
        notebook={notebook}
        signedIn={signedIn}
        wide={wide}
        token={token}
        status={<LiveStatus connection={live.connection} />}
        highlightedId={following ? highlightedId : null}
        following={following}
        registerCell={(cellId, view) => (view ? cells.current.set(cellId, view) : cells.current.delete(cellId))}
      />
    </SharedFrame>
  );
}

interface SharedFrameProps {
  signedIn: boolean;
  token: string;
  children: ReactNode;
  bar?: ReactNode;
  scroll?: RefObject<ScrollView | null>;
  column?: RefObject<View | null>;
}

function SharedFrame({ signedIn, token, children, bar, scroll, column }: SharedFrameProps) {
  return (
    <View style={styles.page}>
      <View style={styles.band}>
        <View style={styles.brand}>
          <RungMark size={24} />
          <Text style={styles.brandName}>Rungbook</Text>
        </View>
        <Link href={signedIn ? '/notebooks' : signInHref(sharedPagePath(token))} testID="shared-nav">
          <Text style={styles.navText}>{signedIn ? 'Your notebooks' : 'Sign in'}</Text>
        </Link>
      </View>
      {bar}
      <ScrollView ref={scroll} style={styles.scroll} contentContainerStyle={styles.content}>
        <View ref={column} style={styles.column}>{children}</View>
      </ScrollView>
    </View>
  );
}

interface SharedNotebookProps {
  notebook: NotebookDetail;
  signedIn: boolean;
  wide: boolean;
  token: string;
  status: ReactNode;
  highlightedId: string | null;
  /** Set while following a presenter: the cell they are at. */
  following: { cellId: string | null; name: string } | null;
  registerCell: (cellId: string, view: View | null) => void;
}

function SharedNotebook({ notebook, signedIn, wide, token, status, highlightedId, following, registerCell }: SharedNotebookProps) {
  // Through a commenter link, posting needs a signed-in person: until then the threads are read-only.
  const commentRole = signedIn ? notebook.role : 'viewer';
  const about = (
    <View style={styles.side}>
      <Notice tone="info" message="Read-only view through a shared link" testID="shared-banner" />
      <View style={styles.facts}>
        <Text style={styles.muted}>Your access:</Text>
        <RoleBadge role={notebook.role} testID="shared-role" />
        {status}
      </View>
      <Text style={styles.muted}>
        {[`by ${notebook.ownerName}`, `${notebook.cellCount} ${notebook.cellCount === 1 ? 'cell' : 'cells'}`, `changed ${new Date(notebook.updatedAt).toLocaleString()}`].join(' · ')}
      </Text>
      <CommentsPlace notebook={notebook} signedIn={signedIn} commentRole={commentRole} token={token} />
    </View>
  );
  const cells = (
    <View style={styles.cells}>
      {notebook.cells.length === 0 ? <Text style={styles.muted}>This notebook has no cells yet.</Text> : null}
      {notebook.cells.map((cell) => (
        <View key={cell.id} ref={(view) => registerCell(cell.id, view)} style={cell.id === highlightedId && styles.highlighted} testID={cell.id === highlightedId ? 'highlighted-cell' : undefined}>
          {following && cell.id === following.cellId ? <Text style={styles.presenterHere} testID={`cell-${cell.label}-presenter`}>{following.name} is here</Text> : null}
          <ReadOnlyCell notebook={notebook} cell={cell} shareToken={token} commentRole={commentRole} />
        </View>
      ))}
    </View>
  );
  return (
    <View style={styles.notebook} testID="shared-notebook">
      <Text style={styles.title} accessibilityRole="header" testID="shared-title">{notebook.title}</Text>
      {notebook.summary ? <Text style={styles.summary}>{notebook.summary}</Text> : null}
      {wide ? (
        <View style={styles.columns}>
          <View style={styles.main}>{cells}</View>
          <View style={styles.aside}>{about}</View>
        </View>
      ) : (
        <>
          {about}
          {cells}
        </>
      )}
    </View>
  );
}

function CommentsPlace({ notebook, signedIn, commentRole, token }: { notebook: NotebookDetail; signedIn: boolean; commentRole: NotebookRole; token: string }) {
  return (
    <View testID="shared-comments-place">
      <NotebookComments notebookId={notebook.id} role={commentRole} shareToken={token} />
      {notebook.role === 'commenter' && !signedIn ? (
        <Card testID="shared-comment-sign-in">
          <Text style={styles.body}>This link lets you comment on the notebook once you sign in.</Text>
          <AuthLink href={signInHref(sharedPagePath(token))} label="Sign in to comment" testID="shared-sign-in" />
        </Card>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { flex: 1, backgroundColor: colors.paper },
  band: { backgroundColor: colors.slate, paddingHorizontal: spacing.lg, paddingVertical: spacing.md, flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: spacing.md },
  brand: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  navText: { fontFamily: fonts.medium, fontSize: 14, color: colors.slateText, textDecorationLine: 'underline' },
  brandName: { fontFamily: fonts.semibold, fontSize: 20, color: colors.slateText },
  scroll: { flex: 1 },
  content: { padding: spacing.lg, paddingBottom: spacing.xxl },
  column: { width: '100%', maxWidth: 1100, alignSelf: 'center', gap: spacing.lg },
  notebook: { gap: spacing.lg },
  title: { fontFamily: fonts.semibold, fontSize: 26, color: colors.ink },
  summary: { fontFamily: fonts.regular, fontSize: 15, color: colors.inkSoft, lineHeight: 22 },
  columns: { flexDirection: 'row', alignItems: 'flex-start', gap: spacing.xl },
  main: { flex: 1, minWidth: 0 },
  aside: { width: 320 },
  side: { gap: spacing.md },
  cells: { gap: spacing.lg },
  facts: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: spacing.sm },
  highlighted: { borderRadius: 10, borderWidth: 2, borderColor: colors.amber, padding: 2, gap: spacing.xs },
  presenterHere: { fontFamily: fonts.semibold, fontSize: 12, color: colors.amberDeep, paddingHorizontal: spacing.sm },
  body: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 22, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
