import { useQuery } from '@tanstack/react-query';
import { tokenSchema } from '@underfoot/core';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { toast } from 'sonner';
import { AuthLayout } from '@/components/layout/auth-layout';
import { Button, ButtonLink } from '@/components/ui/button';
import { SectionLoading } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { roleInSentence } from '@/config/roles';
import { errorMessage, isApiError } from '@/lib/api-client';
import { homePathOf } from '@/lib/auth';
import { invitationQueryOptions } from '../api';
import { AcceptInvitationForm } from '../components/accept-invitation-form';
import { LinkProblem } from '../components/link-problem';

function InvitationBody({ token }: { token: string }) {
  const navigate = useNavigate();
  const invitation = useQuery(invitationQueryOptions(token));

  if (invitation.isPending) return <SectionLoading label="Opening your invitation…" />;

  if (invitation.isError) {
    const error = invitation.error;
    if (isApiError(error, 404) || isApiError(error, 410)) {
      return (
        <LinkProblem
          title={isApiError(error, 410) ? 'This invitation can no longer be used' : 'We could not find this invitation'}
          action={
            <ButtonLink to={paths.auth.signIn.getHref()} variant="secondary">
              Go to sign in
            </ButtonLink>
          }
        >
          <p>{errorMessage(error)}</p>
          <p className="mt-1">
            If you already accepted it, sign in with your e-mail address. Otherwise ask the person who invited you to send a new invitation.
          </p>
        </LinkProblem>
      );
    }
    return (
      <LinkProblem
        title="The invitation could not be opened"
        action={
          <Button onClick={() => void invitation.refetch()} pending={invitation.isFetching}>
            Try again
          </Button>
        }
      >
        <p>{errorMessage(error)}</p>
      </LinkProblem>
    );
  }

  const { data } = invitation;
  return (
    <div className="space-y-6">
      <p>
        <strong>{data.companyName}</strong> invited you to Underfoot as {roleInSentence[data.role]}. Choose a password to finish.
      </p>
      <AcceptInvitationForm
        token={token}
        invitation={data}
        onDone={(user) => {
          toast.success(`Welcome to Underfoot, ${user.name}.`);
          void navigate(homePathOf(user.role), { replace: true });
        }}
      />
    </div>
  );
}

export function AcceptInvitationRoute() {
  const [searchParams] = useSearchParams();
  const token = tokenSchema.safeParse(searchParams.get('token') ?? '');

  return (
    <AuthLayout title="Accept your invitation">
      {token.success ? (
        <InvitationBody token={token.data} />
      ) : (
        <LinkProblem
          title="This invitation link is incomplete"
          action={
            <ButtonLink to={paths.auth.signIn.getHref()} variant="secondary">
              Go to sign in
            </ButtonLink>
          }
        >
          <p>The address may have been cut off when it was copied from the e-mail. Open the link straight from the e-mail.</p>
        </LinkProblem>
      )}
    </AuthLayout>
  );
}
