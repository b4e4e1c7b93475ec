import { ChoiceRow } from '../notebook/ChoiceRow';
import type { GrantableRole } from '../../shared/notebook/sharing';
import { roleLabels } from './roles';

interface RolePickerProps<R extends GrantableRole> {
  label: string;
  /** Only the roles the caller may hand out (see grantableBy). */
  roles: readonly R[];
  value: R;
  onChange: (role: R) => void;
  /** Each choice gets `<testID>-<role>`. */
  testID: string;
}

export function RolePicker<R extends GrantableRole>({ label, roles, value, onChange, testID }: RolePickerProps<R>) {
  return <ChoiceRow label={label} options={roles.map((role) => ({ value: role, label: roleLabels[role] }))} value={value} onChange={onChange} testID={testID} />;
}
