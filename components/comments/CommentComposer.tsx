import { useState } from 'react';
import { Pressable, StyleSheet, Text, TextInput, View, type NativeSyntheticEvent, type TextInputKeyPressEventData } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useMentionCandidatesQuery } from '../../hooks/api/comments';
import { COMMENT_MAX_CHARS, type MentionCandidate } from '../../shared/notebook/sharing';
import { ChipButton } from '../notebook/ChipButton';
import { Notice } from '../ui/Notice';
import { insertMention, mentionQueryAt } from './mentions';

interface CommentComposerProps {
  notebookId: string;
  /** Offer `@` autocomplete (people with access); off where the candidates cannot be listed. */
  mentions: boolean;
  placeholder: string;
  submitLabel: string;
  initialText?: string;
  onSubmit: (body: string) => Promise<unknown>;
  onCancel?: () => void;
  boxTestID: string;
  sendTestID: string;
}

const MAX_OPTIONS = 6;
/** On web the native event is the DOM keyboard event, with its modifier keys. */
type KeyEvent = NativeSyntheticEvent<TextInputKeyPressEventData & { ctrlKey?: boolean; metaKey?: boolean }> & { preventDefault?: () => void };

/** The server's rule (handle starts with, or name contains, the letters), applied to a previous answer while the new one loads. */
const matches = (person: MentionCandidate, search: string) => {
  const wanted = search.toLowerCase();
  return person.handle.toLowerCase().startsWith(wanted) || person.name.toLowerCase().includes(wanted);
};

/** A comment box: Markdown and $TeX$, `@` shows people to mention (arrow keys + Enter, or tap). */
export function CommentComposer({ notebookId, mentions, placeholder, submitLabel, initialText = '', onSubmit, onCancel, boxTestID, sendTestID }: CommentComposerProps) {
  const [text, setText] = useState(initialText);
  const [caret, setCaret] = useState<number | null>(null);
  const [highlighted, setHighlighted] = useState(0);
  const [dismissedAt, setDismissedAt] = useState<number | null>(null);
  const [sending, setSending] = useState(false);
  const [error, setError] = useState<string | null>(null);

  const query = mentions ? mentionQueryAt(text, caret ?? text.length) : null;
  const open = query !== null && dismissedAt !== query.start;
  const candidates = useMentionCandidatesQuery(notebookId, open ? query.search : null);
  const answered = candidates.isPlaceholderData ? (candidates.data ?? []).filter((person) => query !== null && matches(person, query.search)) : candidates.data ?? [];
  const options = open ? answered.slice(0, MAX_OPTIONS) : [];
  const active = Math.min(highlighted, Math.max(0, options.length - 1));

  const change = (next: string) => {
    setText(next);
    setCaret(null);
    setHighlighted(0);
    setError(null);
  };
  const choose = (person: MentionCandidate) => {
    if (!query) return;
    const inserted = insertMention(text, query, person.handle, caret ?? text.length);
    setText(inserted.text);
    setCaret(inserted.caret);
    setHighlighted(0);
  };
  const onKeyPress = (event: KeyEvent) => {
    const { key, ctrlKey, metaKey } = event.nativeEvent;
    if (key === 'Enter' && (ctrlKey || metaKey)) {
      event.preventDefault?.();
      void send();
      return;
    }
    if (!options.length) return;
    const step = key === 'ArrowDown' ? 1 : key === 'ArrowUp' ? -1 : 0;
    if (step) setHighlighted((active + step + options.length) % options.length);
    else if (key === 'Enter' || key === 'Tab') choose(options[active]);
    else if (key === 'Escape') setDismissedAt(query?.start ?? null);
    else return;
    event.preventDefault?.();
  };
  const send = async () => {
    const body = text.trim();
    if (!body || sending) return;
    setSending(true);
    try {
      await onSubmit(body);
      change('');
    } catch (failure) {
      setError(failure instanceof Error ? failure.message : 'The comment could not be saved.');
    } finally {
      setSending(false);
    }
  };

  return (
    <View style={styles.wrap}>
      <TextInput
        accessibilityLabel={placeholder}
        placeholder={placeholder}
        placeholderTextColor={colors.inkFaint}
        multiline
        value={text}
        maxLength={COMMENT_MAX_CHARS}
        onChangeText={change}
        onSelectionChange={(event) => setCaret(event.nativeEvent.selection.end)}
        onKeyPress={onKeyPress}
        autoCapitalize="sentences"
        style={styles.input}
        testID={boxTestID}
      />
      {options.length ? (
        <View style={styles.options} accessibilityRole="menu" testID={`${boxTestID}-mentions`}>
          {options.map((person, index) => (
            <Pressable
              key={person.id}
              accessibilityRole="menuitem"
              accessibilityState={{ selected: index === active }}
              onPress={() => choose(person)}
              style={[styles.option, index === active && styles.optionActive]}
              testID={`mention-option-${person.handle}`}
            >
              <Text style={styles.optionName}>{person.name}</Text>
              <Text style={styles.optionHandle}>@{person.handle}</Text>
            </Pressable>
          ))}
        </View>
      ) : null}
      {error ? <Notice tone="error" message={error} testID={`${boxTestID}-error`} /> : null}
      <View style={styles.actions}>
        <Text style={styles.hint}>{mentions ? 'Markdown, $TeX$, @ to mention' : 'Markdown and $TeX$'}</Text>
        {onCancel ? <ChipButton label="Cancel" onPress={onCancel} testID={`${boxTestID}-cancel`} /> : null}
        <ChipButton label={sending ? 'Sending…' : submitLabel} tone="accent" disabled={!text.trim() || sending} onPress={() => void send()} testID={sendTestID} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: spacing.sm },
  input: { minHeight: 64, borderWidth: 1, borderColor: colors.rule, borderRadius: 6, padding: spacing.sm, fontFamily: fonts.regular, fontSize: 15, color: colors.ink, backgroundColor: colors.surface, textAlignVertical: 'top' },
  options: { borderWidth: 1, borderColor: colors.rule, borderRadius: 6, backgroundColor: colors.surface, overflow: 'hidden' },
  option: { flexDirection: 'row', alignItems: 'center', gap: spacing.sm, paddingVertical: spacing.sm, paddingHorizontal: spacing.md, minHeight: 40 },
  optionActive: { backgroundColor: colors.amberWash },
  optionName: { fontFamily: fonts.medium, fontSize: 14, color: colors.ink },
  optionHandle: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  actions: { flexDirection: 'row', alignItems: 'center', justifyContent: 'flex-end', flexWrap: 'wrap', gap: spacing.sm },
  hint: { fontFamily: fonts.regular, fontSize: 12, color: colors.inkFaint, marginRight: 'auto' },
});
