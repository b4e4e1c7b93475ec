import type { ReactNode } from 'react';
import { Link } from 'expo-router';
import { ScrollView, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';
import { isUnknownLink, useSharedNotebookQuery } from '../../hooks/api/sharing';
import { useWideLayout } from '../../hooks/useWideLayout';
import type { NotebookDetail } from '../../shared/notebook';
import { shareTokenParam } from '../../shared/notebook/sharing';
import { AuthLink } from '../auth/AuthLink';
import { NotebookComments } from '../comments';
import { RungMark } from '../navigation/RungMark';
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
  const body = !wellFormed || isUnknownLink(shared.error) ? (
    <Notice tone="info" message={UNKNOWN_LINK_MESSAGE} testID="shared-unknown" />
  ) : shared.isError ? (
    <Notice tone="error" message={shared.error.message} testID="shared-error" />
  ) : shared.data ? (
    <SharedNotebook notebook={shared.data} signedIn={signedIn} wide={wide} token={token} />
  ) : (
    <Text style={styles.muted}>Opening the notebook…</Text>
  );
  return <SharedFrame signedIn={signedIn}>{body}</SharedFrame>;
}

function SharedFrame({ signedIn, children }: { signedIn: boolean; children: ReactNode }) {
  return (
    <View style={styles.page}>
      <View style={styles.band}>
        <View style={styles.brand}>
          <RungMark size={24} />
          <Text style={styles.brandName}>Rungbook</Text>
        </View>
        <Link href={signedIn ? '/notebooks' : '/sign-in'} testID="shared-nav">
          <Text style={styles.navText}>{signedIn ? 'Your notebooks' : 'Sign in'}</Text>
        </Link>
      </View>
      <ScrollView style={styles.scroll} contentContainerStyle={styles.content}>
        <View style={styles.column}>{children}</View>
      </ScrollView>
    </View>
  );
}

function SharedNotebook({ notebook, signedIn, wide, token }: { notebook: NotebookDetail; signedIn: boolean; wide: boolean; token: string }) {
  const about = (
    <View style={styles.side}>
      <Notice tone="info" message="Read-only view through a shared link" testID="shared-banner" />
      <View style={styles.facts}>
        <Text style={styles.muted}>Your access:</Text>
        <RoleBadge role={notebook.role} testID="shared-role" />
      </View>
      <Text style={styles.muted}>
        {[`by ${notebook.ownerName}`, `${notebook.cellCount} ${notebook.cellCount === 1 ? 'cell' : 'cells'}`, `changed ${new Date(notebook.updatedAt).toLocaleString()}`].join(' · ')}
      </Text>
      <CommentsPlace notebook={notebook} signedIn={signedIn} token={token} />
    </View>
  );
  const cells = (
    <View style={styles.cells}>
      {notebook.cells.length === 0 ? <Text style={styles.muted}>This notebook has no cells yet.</Text> : null}
      {notebook.cells.map((cell) => <ReadOnlyCell key={cell.id} notebook={notebook} cell={cell} />)}
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

function CommentsPlace({ notebook, signedIn, token }: { notebook: NotebookDetail; signedIn: boolean; token: string }) {
  return (
    <View testID="shared-comments-place">
      {/* Through a commenter link, posting needs a signed-in person: until then the threads are read-only. */}
      <NotebookComments notebookId={notebook.id} role={signedIn ? notebook.role : 'viewer'} shareToken={token} />
      {notebook.role === 'commenter' && !signedIn ? (
        <Card testID="shared-comment-sign-in">
          <Text style={styles.body}>This link lets you comment on the notebook once you sign in.</Text>
          <AuthLink href="/sign-in" label="Sign in to comment" testID="shared-sign-in" />
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
  facts: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm },
  body: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 22, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
