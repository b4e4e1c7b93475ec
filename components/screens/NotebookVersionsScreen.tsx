import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useNotebookLive } from '../../hooks/api/live';
import { useNotebookQuery, useRestoreVersionMutation, useVersionsQuery } from '../../hooks/api/notebooks';
import type { VersionSummary } from '../../shared/notebook';
import { AccessRemoved } from '../live/AccessRemoved';
import { ChipButton } from '../notebook/ChipButton';
import { SaveVersionForm } from '../notebook/SaveVersionForm';
import { VersionComparisonView, VersionReader } from '../notebook/VersionPanels';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';

type Panel = { kind: 'read'; versionId: string } | { kind: 'compare'; from: string; to: string } | null;

export function NotebookVersionsScreen({ notebookId }: { notebookId: string }) {
  const notebook = useNotebookQuery(notebookId);
  // Keeps the role (restore and save appear or vanish at once) and the list current while others save versions.
  const live = useNotebookLive(notebookId);
  const versions = useVersionsQuery(notebookId);
  const restore = useRestoreVersionMutation(notebookId);
  const [picked, setPicked] = useState<string[]>([]);
  const [panel, setPanel] = useState<Panel>(null);
  const [confirmRestore, setConfirmRestore] = useState<string | null>(null);
  const list = versions.data ?? [];
  const togglePick = (id: string) => setPicked((current) => (current.includes(id) ? current.filter((p) => p !== id) : [...current, id].slice(-2)));
  const compare = () => {
    const [a, b] = picked.map((id) => list.find((v) => v.id === id)!).sort((x, y) => x.number - y.number);
    setPanel({ kind: 'compare', from: a.id, to: b.id });
  };
  const doRestore = (version: VersionSummary) =>
    restore.mutate(version.id, { onSuccess: () => { setConfirmRestore(null); router.push(`/notebooks/${notebookId}`); } });

  const actions = <ChipButton label="Back to the notebook" onPress={() => router.push(`/notebooks/${notebookId}`)} testID="back-to-notebook" />;
  if (live.connection === 'revoked') {
    return (
      <ScreenBody title="Versions">
        <AccessRemoved />
      </ScreenBody>
    );
  }
  return (
    <ScreenBody title="Versions" subtitle={notebook.data ? `${notebook.data.title} — every saved version; restoring one adds a new version, nothing is lost.` : undefined} actions={actions}>
      {notebook.data?.canEdit ? (
        <Card>
          <Text style={styles.heading}>Save the notebook as it is now</Text>
          <SaveVersionForm notebookId={notebookId} />
        </Card>
      ) : null}
      {versions.isError ? <Notice tone="error" message={versions.error.message} /> : null}
      {restore.isError ? <Notice tone="error" message={restore.error.message} /> : null}
      {list.length === 0 && versions.data ? <Notice tone="info" message="No versions saved yet." /> : null}
      {list.length >= 2 ? (
        <View style={styles.compareBar}>
          <Text style={styles.muted}>{picked.length === 2 ? 'Two versions picked.' : 'Pick two versions to compare them.'}</Text>
          <ChipButton label="Compare" tone="accent" disabled={picked.length !== 2} onPress={compare} testID="compare-versions" />
        </View>
      ) : null}
      {list.map((version) => (
        <Card key={version.id} testID={`version-${version.number}`}>
          <View style={styles.row}>
            <Text style={styles.number}>v{version.number}</Text>
            <View style={styles.text}>
              <Text style={styles.message}>{version.message}</Text>
              <Text style={styles.muted}>{version.authorName} · {new Date(version.createdAt).toLocaleString()}{version.automatic ? ' · saved automatically' : ''}</Text>
            </View>
          </View>
          <View style={styles.actions}>
            <ChipButton label="Open" onPress={() => setPanel({ kind: 'read', versionId: version.id })} testID={`version-${version.number}-open`} />
            <ChipButton label={picked.includes(version.id) ? 'Picked' : 'Pick'} selected={picked.includes(version.id)} onPress={() => togglePick(version.id)} testID={`version-${version.number}-pick`} />
            {notebook.data?.canEdit ? (
              confirmRestore === version.id ? (
                <ChipButton label={restore.isPending ? 'Restoring…' : 'Restore this version'} tone="danger" onPress={() => doRestore(version)} testID={`version-${version.number}-restore-confirm`} />
              ) : (
                <ChipButton label="Restore" onPress={() => setConfirmRestore(version.id)} testID={`version-${version.number}-restore`} />
              )
            ) : null}
          </View>
        </Card>
      ))}
      {panel?.kind === 'read' ? <VersionReader notebookId={notebookId} versionId={panel.versionId} /> : null}
      {panel?.kind === 'compare' ? <VersionComparisonView notebookId={notebookId} from={panel.from} to={panel.to} /> : null}
    </ScreenBody>
  );
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 16, color: colors.ink },
  compareBar: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: spacing.md, flexWrap: 'wrap' },
  row: { flexDirection: 'row', gap: spacing.md, alignItems: 'flex-start' },
  number: { fontFamily: fonts.semibold, fontSize: 16, color: colors.amberDeep, minWidth: 36 },
  text: { flex: 1, gap: 2 },
  message: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  actions: { flexDirection: 'row', gap: spacing.sm, flexWrap: 'wrap' },
});
