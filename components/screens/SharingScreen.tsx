import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMeQuery } from '../../hooks/api/auth';
import { useNotebookQuery } from '../../hooks/api/notebooks';
import { useSharingQuery } from '../../hooks/api/sharing';
import { useWideLayout } from '../../hooks/useWideLayout';
import { can, type SharingView } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { AddGroupCard, AddPersonCard } from '../sharing/AddMemberCard';
import { InvitationList } from '../sharing/InvitationList';
import { MemberList } from '../sharing/MemberList';
import { RoleBadge } from '../sharing/RoleBadge';
import { roleHints } from '../sharing/roles';
import { ShareLinks } from '../sharing/ShareLinks';
import { TransferOwnership } from '../sharing/TransferOwnership';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';

/** Who has which role on a notebook; people, groups and links on one page (people | links side by side on wide screens). */
export function SharingScreen({ notebookId }: { notebookId: string }) {
  const sharing = useSharingQuery(notebookId);
  const notebook = useNotebookQuery(notebookId);
  const me = useMeQuery();
  const wide = useWideLayout();
  const [transferredTo, setTransferredTo] = useState<string | null>(null);
  const actions = <ChipButton label="Back to the notebook" onPress={() => router.push(`/notebooks/${notebookId}`)} testID="back-to-notebook" />;
  const subtitle = notebook.data ? `Who can open “${notebook.data.title}”, and what they may do.` : undefined;
  return (
    <ScreenBody title="Sharing" subtitle={subtitle} actions={actions}>
      {transferredTo ? <Notice tone="success" message={`${transferredTo} now owns this notebook. You are an editor.`} testID="transfer-done" /> : null}
      {sharing.isError ? <Notice tone="error" message={sharing.error.message} testID="sharing-error" /> : null}
      {sharing.isPending ? <Text style={styles.muted}>Loading…</Text> : null}
      {sharing.data ? <SharingPanels notebookId={notebookId} sharing={sharing.data} myId={me.data?.id ?? null} wide={wide} onTransferred={setTransferredTo} /> : null}
    </ScreenBody>
  );
}

interface SharingPanelsProps {
  notebookId: string;
  sharing: SharingView;
  myId: string | null;
  wide: boolean;
  onTransferred: (name: string) => void;
}

function SharingPanels({ notebookId, sharing, myId, wide, onTransferred }: SharingPanelsProps) {
  const manage = can(sharing.role, 'manageSharing');
  const twoColumns = wide && manage;
  const column = twoColumns ? styles.sideBySide : styles.stack;
  const people = (
    <View style={column}>
      <MemberList notebookId={notebookId} sharing={sharing} myId={myId} />
      {manage ? <AddPersonCard notebookId={notebookId} callerRole={sharing.role} /> : null}
      <InvitationList notebookId={notebookId} invitations={sharing.invitations} manage={manage} />
      {manage ? <AddGroupCard notebookId={notebookId} sharing={sharing} /> : null}
      {can(sharing.role, 'transferOwnership') ? <TransferOwnership notebookId={notebookId} members={sharing.members} myId={myId} onTransferred={onTransferred} /> : null}
    </View>
  );
  return (
    <>
      <View style={styles.myRole}>
        <Text style={styles.body}>Your role:</Text>
        <RoleBadge role={sharing.role} testID="sharing-my-role" />
        <Text style={styles.muted}>{roleHints[sharing.role]}</Text>
      </View>
      {manage ? null : <Notice tone="info" message="Editors and the owner decide who has access; you can see who has it." testID="sharing-read-only" />}
      <View style={twoColumns ? styles.columns : styles.stack}>
        {people}
        {manage ? (
          <View style={column}>
            <ShareLinks notebookId={notebookId} callerRole={sharing.role} links={sharing.links} />
          </View>
        ) : null}
      </View>
    </>
  );
}

const styles = StyleSheet.create({
  columns: { flexDirection: 'row', alignItems: 'flex-start', gap: spacing.lg },
  stack: { gap: spacing.lg },
  sideBySide: { flex: 1, minWidth: 0, gap: spacing.lg },
  myRole: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: spacing.sm },
  body: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
});
