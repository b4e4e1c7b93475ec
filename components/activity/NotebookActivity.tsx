import { useRef, useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useFollowingQuery, useFollowNotebookMutation, useNotebookActivityQuery } from '../../hooks/api/activity';
import { NOTEBOOK_EVENT_KINDS, type NotebookEventKind, type NotebookEventView } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Notice } from '../ui/Notice';
import { when } from '../comments/when';
import { eventKindTitles } from './eventKinds';

export interface NotebookActivityProps {
  notebookId: string;
  /** Bring the cell an event is about into view. */
  onShowCell?: (cellId: string) => void;
}

/** Everyone who has acted in the log so far, kept while a filter narrows the list. */
function usePeopleSeen(events: NotebookEventView[] | undefined): Map<string, string> {
  const seen = useRef(new Map<string, string>());
  for (const event of events ?? []) if (event.actorId && event.actorName) seen.current.set(event.actorId, event.actorName);
  return seen.current;
}

/** Who did what in the notebook, newest first, filtered by kind and by person. */
export function NotebookActivity({ notebookId, onShowCell }: NotebookActivityProps) {
  const [kind, setKind] = useState<NotebookEventKind | null>(null);
  const [actorId, setActorId] = useState<string | null>(null);
  const [choosing, setChoosing] = useState<'kind' | 'person' | null>(null);
  const events = useNotebookActivityQuery(notebookId, { kind, actorId });
  const people = usePeopleSeen(events.data);
  const toggle = (menu: 'kind' | 'person') => setChoosing(choosing === menu ? null : menu);

  return (
    <View style={styles.panel} testID="notebook-activity">
      <View style={styles.header}>
        <Text style={styles.title} accessibilityRole="header">
          History
        </Text>
        <View style={styles.row}>
          <FollowToggle notebookId={notebookId} />
          <ChipButton label={`What: ${kind ? eventKindTitles[kind] : 'everything'}`} selected={choosing === 'kind'} onPress={() => toggle('kind')} testID="notebook-activity-kind" />
          <ChipButton label={`Who: ${actorId ? people.get(actorId) ?? 'someone' : 'anyone'}`} selected={choosing === 'person'} onPress={() => toggle('person')} testID="notebook-activity-person" />
        </View>
      </View>
      {choosing === 'kind' ? (
        <View style={styles.choices}>
          <ChipButton label="Everything" selected={kind === null} onPress={() => { setKind(null); setChoosing(null); }} testID="notebook-activity-kind-all" />
          {NOTEBOOK_EVENT_KINDS.map((option) => (
            <ChipButton key={option} label={eventKindTitles[option]} selected={kind === option} onPress={() => { setKind(option); setChoosing(null); }} testID={`notebook-activity-kind-${option}`} />
          ))}
        </View>
      ) : null}
      {choosing === 'person' ? (
        <View style={styles.choices}>
          <ChipButton label="Anyone" selected={actorId === null} onPress={() => { setActorId(null); setChoosing(null); }} testID="notebook-activity-person-all" />
          {[...people].map(([id, name]) => (
            <ChipButton key={id} label={name} selected={actorId === id} onPress={() => { setActorId(id); setChoosing(null); }} testID={`notebook-activity-person-${id}`} />
          ))}
        </View>
      ) : null}
      {events.isError ? <Notice tone="error" message={events.error.message} /> : null}
      {events.isPending ? <Text style={styles.muted}>Loading the history…</Text> : null}
      {events.data?.length === 0 ? <Text style={styles.muted}>{kind || actorId ? 'Nothing matches these filters.' : 'Nothing has happened here yet.'}</Text> : null}
      {events.data?.map((event) => (
        <View key={event.id} style={styles.event} testID={`notebook-activity-event-${event.id}`}>
          <Text style={styles.text}>
            <Text style={styles.actor}>{event.actorName ?? 'Someone'}</Text> {event.text}
          </Text>
          <View style={styles.row}>
            <Text style={styles.muted}>{when(event.createdAt)}</Text>
            {event.cellId && onShowCell ? <ChipButton label="Show cell" onPress={() => onShowCell(event.cellId!)} testID={`notebook-activity-show-${event.id}`} /> : null}
          </View>
        </View>
      ))}
    </View>
  );
}

/** Follow the notebook: changes by others then reach my activity list. */
function FollowToggle({ notebookId }: { notebookId: string }) {
  const following = useFollowingQuery(notebookId);
  const change = useFollowNotebookMutation(notebookId);
  if (following.data === undefined) return null;
  return (
    <ChipButton
      label={following.data ? 'Following ✓' : 'Follow'}
      selected={following.data}
      disabled={change.isPending}
      accessibilityLabel={following.data ? 'Stop following this notebook' : 'Follow this notebook: its changes reach your activity list'}
      onPress={() => change.mutate(!following.data)}
      testID="notebook-follow"
    />
  );
}

const styles = StyleSheet.create({
  panel: { gap: spacing.md },
  header: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', flexWrap: 'wrap', gap: spacing.sm },
  title: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  row: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: spacing.sm },
  choices: { flexDirection: 'row', flexWrap: 'wrap', gap: spacing.sm, padding: spacing.sm, borderRadius: 8, backgroundColor: colors.paper, borderWidth: 1, borderColor: colors.rule },
  event: { gap: 2, paddingVertical: spacing.xs, borderBottomWidth: 1, borderBottomColor: colors.rule },
  text: { fontFamily: fonts.regular, fontSize: 14, lineHeight: 20, color: colors.ink },
  actor: { fontFamily: fonts.semibold },
  muted: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint },
});
