import { useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { router } from 'expo-router';
import { colors, fonts, spacing } from '../../constants/theme';
import { useGroupsQuery } from '../../hooks/api/groups';
import { useCreateNotebookMutation, useNotebooksQuery, type NotebookListFilter } from '../../hooks/api/notebooks';
import { createNotebookInput, type NotebookSummary } from '../../shared/notebook';
import { checkLocally, errorsFromServer, type FormErrors } from '../auth/formErrors';
import { Formula } from '../formula';
import { ChipButton } from '../notebook/ChipButton';
import { ChoiceRow } from '../notebook/ChoiceRow';
import { ImportNotebookCard } from '../notebook/ImportNotebookCard';
import { RoleBadge } from '../sharing/RoleBadge';
import { sharedByLine } from '../sharing/roles';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { ScreenBody } from '../ui/ScreenBody';
import { TextField } from '../ui/TextField';

export function NotebooksScreen() {
  const [search, setSearch] = useState('');
  const [filter, setFilter] = useState<NotebookListFilter>('all');
  const [groupId, setGroupId] = useState<string | null>(null);
  const [creating, setCreating] = useState(false);
  const [importing, setImporting] = useState(false);
  const notebooks = useNotebooksQuery(search, filter, groupId);
  const searching = search.trim() !== '';
  const narrowed = searching || filter !== 'all';
  const actions = (
    <View style={styles.actions}>
      <Button label="New notebook" onPress={() => setCreating(!creating)} testID="new-notebook" />
      <Button label="Import" variant="quiet" onPress={() => setImporting(!importing)} testID="import-notebook" />
    </View>
  );
  return (
    <ScreenBody title="Notebooks" subtitle="Your calculations, cell by cell." actions={actions}>
      {creating ? <NewNotebookCard onClose={() => setCreating(false)} /> : null}
      {importing ? <ImportNotebookCard onImported={(id) => router.push(`/notebooks/${id}`)} /> : null}
      {notebooks.data && (notebooks.data.length > 0 || narrowed) ? (
        <>
          <TextField label="Search titles and summaries" value={search} onChangeText={setSearch} testID="notebook-search" />
          <ListFilters filter={filter} groupId={groupId} onFilter={setFilter} onGroup={setGroupId} />
        </>
      ) : null}
      {notebooks.isError ? <Notice tone="error" message={notebooks.error.message} /> : null}
      {notebooks.data?.length === 0 && narrowed ? <Notice tone="info" message={noMatchMessage(search, filter)} testID="notebooks-no-match" /> : null}
      {notebooks.data?.length === 0 && !narrowed ? <EmptyNotebooks /> : null}
      {notebooks.data?.length ? <Text style={styles.sortNote}>Most recently changed first</Text> : null}
      {notebooks.data?.map((notebook) => <NotebookRow key={notebook.id} notebook={notebook} />)}
    </ScreenBody>
  );
}

const filterOptions: { value: NotebookListFilter; label: string }[] = [
  { value: 'all', label: 'All' },
  { value: 'mine', label: 'Mine' },
  { value: 'shared', label: 'Shared with me' },
  { value: 'group', label: 'Through a group' },
];

interface ListFiltersProps {
  filter: NotebookListFilter;
  groupId: string | null;
  onFilter: (filter: NotebookListFilter) => void;
  onGroup: (groupId: string | null) => void;
}

/** Mine / shared with me / through a group; with "group", optionally one of my groups. */
function ListFilters({ filter, groupId, onFilter, onGroup }: ListFiltersProps) {
  const groups = useGroupsQuery();
  return (
    <View style={styles.filters}>
      <ChoiceRow label="Show" options={filterOptions} value={filter} onChange={onFilter} testID="notebook-filter" />
      {filter === 'group' && groups.data ? (
        <View style={styles.actions} accessibilityRole="radiogroup" accessibilityLabel="Group">
          <ChipButton label="Any of my groups" selected={groupId === null} onPress={() => onGroup(null)} testID="notebook-filter-group-any" />
          {groups.data.map((group) => (
            <ChipButton key={group.id} label={group.name} selected={groupId === group.id} onPress={() => onGroup(group.id)} testID={`notebook-filter-group-${group.id}`} />
          ))}
        </View>
      ) : null}
    </View>
  );
}

function noMatchMessage(search: string, filter: NotebookListFilter): string {
  const where = { all: 'No notebook', mine: 'None of your own notebooks', shared: 'No notebook shared with you', group: 'No notebook shared with your groups' }[filter];
  return search.trim() ? `${where} matches “${search.trim()}”.` : `${where} yet.`;
}

function NotebookRow({ notebook }: { notebook: NotebookSummary }) {
  const sharedBy = sharedByLine(notebook);
  return (
    <Pressable accessibilityRole="link" onPress={() => router.push(`/notebooks/${notebook.id}`)} testID={`notebook-${notebook.id}`}>
      <Card>
        <View style={styles.titleRow}>
          <Text style={styles.title}>{notebook.title}</Text>
          <RoleBadge role={notebook.role} testID={`notebook-${notebook.id}-role`} />
        </View>
        {notebook.summary ? <Text style={styles.body}>{notebook.summary}</Text> : null}
        {sharedBy ? <Text style={styles.sharedBy} testID={`notebook-${notebook.id}-shared-by`}>{sharedBy}</Text> : null}
        <Text style={styles.meta}>
          {[notebook.ownerName, notebook.groupName, `${notebook.cellCount} ${notebook.cellCount === 1 ? 'cell' : 'cells'}`, `changed ${new Date(notebook.updatedAt).toLocaleString()}`].filter(Boolean).join(' · ')}
        </Text>
      </Card>
    </Pressable>
  );
}

function NewNotebookCard({ onClose }: { onClose: () => void }) {
  const [title, setTitle] = useState('');
  const [summary, setSummary] = useState('');
  const [errors, setErrors] = useState<FormErrors>({ fields: {} });
  const create = useCreateNotebookMutation();
  const submit = () => {
    const { data, errors: local } = checkLocally(createNotebookInput, { title, summary });
    setErrors(local);
    if (!data) return;
    create.mutate(data, { onSuccess: ({ notebook }) => router.push(`/notebooks/${notebook.id}`), onError: (error) => setErrors(errorsFromServer(error)) });
  };
  return (
    <Card testID="new-notebook-card">
      <Text style={styles.title}>A new notebook</Text>
      {errors.message ? <Notice tone="error" message={errors.message} /> : null}
      <TextField label="Title" value={title} onChangeText={setTitle} error={errors.fields.title} onSubmitEditing={submit} testID="new-notebook-title" />
      <TextField label="Summary (optional)" value={summary} onChangeText={setSummary} error={errors.fields.summary} testID="new-notebook-summary" />
      <View style={styles.actions}>
        <Button label="Create" onPress={submit} busy={create.isPending} testID="new-notebook-create" />
        <ChipButton label="Cancel" onPress={onClose} />
      </View>
    </Card>
  );
}

/** What a new member sees before their first notebook: what a notebook is for, in formulas. */
function EmptyNotebooks() {
  return (
    <Card testID="notebooks-empty">
      <Text style={styles.heading}>No notebooks yet</Text>
      <Text style={styles.body}>
        A notebook holds one calculation as a column of cells: the model and its couplings, the loop
        integrals expanded in ε, the β-functions and anomalous dimensions, the fixed points, and the
        critical exponents with their resummations. Every step is typeset so a colleague can check it.
      </Text>
      <Text style={styles.body}>The expansion parameter measures the distance from the upper critical dimension:</Text>
      <View style={styles.formula}>
        <Formula tex={String.raw`\varepsilon = 2s - d`} display testID="epsilon-definition" label="epsilon equals 2 s minus d" />
      </View>
      <Text style={styles.body}>for the action with a non-local kinetic term,</Text>
      <View style={styles.formula}>
        <Formula tex={String.raw`S = \int d^dx\,\Big[\tfrac12\,\phi\,(-\partial^2)^{s/2}\phi + \tfrac{\lambda}{4!}\,\phi^4\Big]`} display label="long-range phi to the fourth action" />
      </View>
      <Text style={styles.body}>A first result a notebook will reproduce, for the one-component model at two loops:</Text>
      <View style={styles.formula}>
        <Formula tex={String.raw`\frac{1}{\nu} = s - \frac{\varepsilon}{3} - \frac{\varepsilon^2}{9}\,\big[\psi(1) - 2\psi(\tfrac{s}{2}) + \psi(s)\big] + O(\varepsilon^3)`} display testID="nu-example" label="one over nu, two-loop expansion" />
      </View>
      <Text style={styles.body}>Press “New notebook” to start one.</Text>
    </Card>
  );
}

const styles = StyleSheet.create({
  actions: { flexDirection: 'row', gap: spacing.sm, alignItems: 'center', flexWrap: 'wrap' },
  heading: { fontFamily: fonts.semibold, fontSize: 18, color: colors.ink },
  title: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink, flexShrink: 1 },
  titleRow: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: spacing.sm },
  sharedBy: { fontFamily: fonts.medium, fontSize: 13, color: colors.amberDeep },
  filters: { gap: spacing.sm },
  body: { fontFamily: fonts.regular, fontSize: 15, lineHeight: 23, color: colors.inkSoft },
  meta: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  sortNote: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint },
  formula: { paddingVertical: spacing.sm, overflow: 'hidden' },
});
