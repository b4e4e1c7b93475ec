import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, spacing } from '../../constants/theme';
import { useCreateShareLinkMutation, useRevokeShareLinkMutation } from '../../hooks/api/sharing';
import { SHARE_LINK_MAX_DAYS, type CreatedShareLink, type LinkRole, type NotebookRole, type ShareLinkView } from '../../shared/notebook/sharing';
import { errorsFromServer, type FormErrors } from '../auth/formErrors';
import { ChipButton } from '../notebook/ChipButton';
import { copyText } from '../notebook/clipboard';
import { monoFont } from '../notebook/monoFont';
import { Button } from '../ui/Button';
import { Card } from '../ui/Card';
import { Notice } from '../ui/Notice';
import { TextField } from '../ui/TextField';
import { RolePicker } from './RolePicker';
import { linkRolesFor, linkState, roleLabels, type LinkState } from './roles';

const DAY_MS = 24 * 60 * 60 * 1000;
const noErrors: FormErrors = { fields: {} };

/** "" = never expires; otherwise a whole number of days up to a year, turned into a moment from now. */
export function expiryFromDays(text: string, now = Date.now()): { expiresAt?: string; error?: string } {
  const trimmed = text.trim();
  if (trimmed === '') return {};
  const days = Number(trimmed);
  if (!/^\d+$/.test(trimmed) || days < 1 || days > SHARE_LINK_MAX_DAYS) return { error: `A whole number of days from 1 to ${SHARE_LINK_MAX_DAYS}, or empty for no expiry` };
  return { expiresAt: new Date(now + days * DAY_MS).toISOString() };
}

/** Secret links that open the notebook read-only without an account; created, listed and revoked here. */
export function ShareLinks({ notebookId, callerRole, links }: { notebookId: string; callerRole: NotebookRole; links: ShareLinkView[] }) {
  const [created, setCreated] = useState<CreatedShareLink | null>(null);
  return (
    <Card testID="share-links">
      <Text style={styles.heading}>Share links</Text>
      <Text style={styles.muted}>Anyone with a link can read the notebook without signing in; a commenter link lets them comment once they sign in.</Text>
      {created ? <CreatedLink link={created} onDismiss={() => setCreated(null)} /> : <NewLinkForm notebookId={notebookId} callerRole={callerRole} onCreated={setCreated} />}
      <LinkList notebookId={notebookId} links={links} />
    </Card>
  );
}

function NewLinkForm({ notebookId, callerRole, onCreated }: { notebookId: string; callerRole: NotebookRole; onCreated: (link: CreatedShareLink) => void }) {
  const roles = linkRolesFor(callerRole);
  const [role, setRole] = useState<LinkRole>('viewer');
  const [days, setDays] = useState('');
  const [errors, setErrors] = useState<FormErrors>(noErrors);
  const create = useCreateShareLinkMutation(notebookId);
  const submit = () => {
    const expiry = expiryFromDays(days);
    if (expiry.error) return setErrors({ fields: { expiresAt: expiry.error } });
    setErrors(noErrors);
    create.mutate({ role, ...(expiry.expiresAt ? { expiresAt: expiry.expiresAt } : {}) }, { onSuccess: onCreated, onError: (error) => setErrors(errorsFromServer(error)) });
  };
  return (
    <View style={styles.form}>
      {errors.message && !errors.fields.expiresAt ? <Notice tone="error" message={errors.message} testID="link-error" /> : null}
      <RolePicker label="The link lets people" roles={roles} value={role} onChange={setRole} testID="link-role" />
      <TextField label="Expires after (days, optional)" value={days} onChangeText={setDays} keyboardType="number-pad" error={errors.fields.expiresAt} hint="Empty: the link works until you revoke it." testID="link-expiry-days" />
      <Button label="Create link" onPress={submit} busy={create.isPending} testID="link-create" />
    </View>
  );
}

/** The token is shown this once: only its hash is stored, so the address cannot be shown again later. */
function CreatedLink({ link, onDismiss }: { link: CreatedShareLink; onDismiss: () => void }) {
  const [copied, setCopied] = useState<boolean | null>(null);
  const copy = async () => setCopied(await copyText(link.url));
  return (
    <View style={styles.created} testID="link-created">
      <Text style={styles.strong}>Copy this address now — it is shown only once.</Text>
      <Text selectable style={styles.url} testID="link-url">{link.url}</Text>
      <View style={styles.actions}>
        <ChipButton label={copied ? 'Copied' : 'Copy'} tone="accent" onPress={() => void copy()} testID="link-copy" />
        <ChipButton label="Done" onPress={onDismiss} testID="link-done" />
      </View>
      {copied === false ? <Notice tone="error" message="The browser did not allow copying; select the address and copy it by hand." /> : null}
    </View>
  );
}

const stateLabels: Record<LinkState, string> = { active: 'active', expired: 'expired', revoked: 'revoked', 'creator-lost-role': 'inactive: its creator no longer manages sharing' };

function LinkList({ notebookId, links }: { notebookId: string; links: ShareLinkView[] }) {
  const revoke = useRevokeShareLinkMutation(notebookId);
  if (links.length === 0) return <Text style={styles.muted} testID="link-none">No share links yet.</Text>;
  return (
    <View>
      {revoke.error ? <Notice tone="error" message={revoke.error.message} /> : null}
      {links.map((link) => {
        const state = linkState(link);
        return (
          <View key={link.id} style={styles.row} testID={`link-row-${link.id}`}>
            <View style={styles.text}>
              <Text style={styles.name}>
                {roleLabels[link.role]} link · <Text style={state === 'active' ? styles.active : styles.inactive} testID={`link-state-${link.id}`}>{stateLabels[state]}</Text>
              </Text>
              <Text style={styles.muted}>{linkFacts(link)}</Text>
            </View>
            {state === 'active' || state === 'creator-lost-role' ? <ChipButton label="Revoke" tone="danger" disabled={revoke.isPending} onPress={() => revoke.mutate(link.id)} testID={`link-revoke-${link.id}`} /> : null}
          </View>
        );
      })}
    </View>
  );
}

function linkFacts(link: ShareLinkView): string {
  const when = (iso: string) => new Date(iso).toLocaleDateString();
  const end = link.revokedAt ? `revoked ${when(link.revokedAt)}` : link.expiresAt ? `${link.active ? 'expires' : 'expired'} ${when(link.expiresAt)}` : 'no expiry';
  return `created by ${link.createdByName} ${when(link.createdAt)} · ${end}`;
}

const styles = StyleSheet.create({
  heading: { fontFamily: fonts.semibold, fontSize: 17, color: colors.ink },
  muted: { fontFamily: fonts.regular, fontSize: 13, color: colors.inkFaint, lineHeight: 19 },
  form: { gap: spacing.md },
  created: { gap: spacing.sm, backgroundColor: colors.amberWash, borderRadius: 6, padding: spacing.md },
  strong: { fontFamily: fonts.semibold, fontSize: 14, color: colors.ink },
  url: { fontFamily: monoFont, fontSize: 13, color: colors.ink, backgroundColor: colors.surface, padding: spacing.sm, borderRadius: 4 },
  actions: { flexDirection: 'row', gap: spacing.sm, flexWrap: 'wrap' },
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', justifyContent: 'space-between', gap: spacing.sm, paddingVertical: spacing.sm, borderTopWidth: 1, borderTopColor: colors.rule },
  text: { flexShrink: 1, flexGrow: 1, gap: 2, minWidth: 160 },
  name: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  active: { color: colors.success },
  inactive: { color: colors.danger },
});
