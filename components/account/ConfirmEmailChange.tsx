import { useEffect, useRef } from 'react';
import { useConfirmEmailChangeMutation } from '../../hooks/api/auth';
import { Notice } from '../ui/Notice';

/** Opening the e-mailed link confirms the new address once; the result stays on screen. */
export function ConfirmEmailChange({ token, onSettled }: { token: string; onSettled?: () => void }) {
  const confirm = useConfirmEmailChangeMutation();
  const sent = useRef(false);
  useEffect(() => {
    if (sent.current) return;
    sent.current = true;
    confirm.mutate(token, { onSettled });
  }, [confirm, token, onSettled]);

  if (confirm.isSuccess) return <Notice tone="success" message={confirm.data.message} testID="email-change-confirmed" />;
  if (confirm.isError) return <Notice tone="error" message={confirm.error.message} testID="email-change-error" />;
  return <Notice tone="info" message="Confirming your new e-mail address…" testID="email-change-pending" />;
}
