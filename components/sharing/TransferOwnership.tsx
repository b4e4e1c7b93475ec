import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useTransferOwnershipMutation } from '../../hooks/api/sharing';
import type { NotebookMemberView } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { memberKey } from './MemberList';

/** Owner only: hand the notebook to a person who already has a role on it; the owner stays on as an editor. */
interface TransferOwnershipProps {
  notebookId: string;
  members: NotebookMemberView[];
  myId: string | null;
  /** The panel outlives this card: once the caller is an editor it is no longer shown. */
  onTransferred: (newOwnerName: string) => void;
}

export function TransferOwnership({ notebookId, members, myId, onTransferred }: TransferOwnershipProps) {
  const [open, setOpen] = useState(false);
  const [picked, setPicked] = useState<NotebookMemberView | null>(null);
  const transfer = useTransferOwnershipMutation(notebookId);
  const candidates = members.filter((member) => member.kind === 'person' && member.subjectId !== myId && member.role !== 'owner');
  const close = () => {
    setOpen(false);
    setPicked(null);
    transfer.reset();
  };
  return (
    <Card testID="transfer-card">
      <Text style={styles.heading}>Ownership</Text>
      {!open ? (
        <>
          <Text style={styles.muted}>The owner can delete the notebook and hand it on. Only people who already have a role here can become its owner.</Text>
          <Button label="Transfer ownership…" variant="quiet" onPress={() => setOpen(true)} disabled={candidates.length === 0} testID="transfer-owner" />
          {candidates.length === 0 ? <Text style={styles.muted}>Share the notebook with someone first.</Text> : null}
        </>
      ) : null}
      {open ? (
        <View style={styles.form}>
          <Text style={styles.label}>New owner</Text>
          <View style={styles.chips} accessibilityRole="radiogroup" accessibilityLabel="New owner">
            {candidates.map((member) => (
              <ChipButton key={member.id} label={member.name} selected={picked?.id === member.id} onPress={() => setPicked(member)} testID={`transfer-pick-${memberKey(member)}`} />
            ))}
          </View>
          {transfer.error ? <Notice tone="error" message={transfer.error.message} testID="transfer-error" /> : null}
          {picked ? (
            <Notice tone="info" message={`Make ${picked.name} the owner? You become an editor and can no longer delete the notebook or take ownership back yourself.`} testID="transfer-question" />
          ) : null}
          <View style={styles.actions}>
            <Button label="Transfer" variant="danger" disabled={!picked} busy={transfer.isPending} onPress={() => picked && transfer.mutate(picked.subjectId, { onSuccess: () => onTransferred(picked.name) })} testID="transfer-confirm" />
            <Button label="Cancel" variant="quiet" onPress={close} testID="transfer-cancel" />
          </View>
        </View>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  label: { fontFamily: fonts.medium, fontSize: 14, color: colors.inkSoft },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint, lineHeight: 19 },
  form: { gap: spacing.md },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm },
  actions: { flexDirection: 'row', gap: spacing.sm, flexWrap: 'wrap' },
});
