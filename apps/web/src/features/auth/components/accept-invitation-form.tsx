import type { CurrentUser } from '@underfoot/core';
import { NewAccountForm } from '@/components/ui/new-account-form';
import { useAcceptInvitation, type Invitation } from '../api';

export function AcceptInvitationForm({
  token,
  invitation,
  onDone,
}: {
  token: string;
  invitation: Invitation;
  onDone: (user: CurrentUser) => void;
}) {
  const accept = useAcceptInvitation({ onSuccess: onDone });
  return (
    <NewAccountForm
      email={invitation.email}
      emailNote="You will sign in with this address."
      defaultName={invitation.name}
      error={accept.error}
      pending={accept.isPending}
      onSubmit={(values, callbacks) => accept.mutate({ token, ...values }, callbacks)}
    />
  );
}
