import { tokenSchema } from '@underfoot/core';
import { useSearchParams } from 'react-router-dom';
import { AuthLayout } from '@/components/layout/auth-layout';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { useCurrentUser } from '@/lib/auth';
import { useConfirmEmailChange } from '../api';

/**
 * The link from the new address. Confirming takes a press of the button, not
 * just opening the page, so a mail scanner that follows links changes nothing.
 * It proves the mailbox and signs nobody in.
 */
export function ConfirmEmailRoute() {
  const [params] = useSearchParams();
  const token = tokenSchema.safeParse(params.get('token') ?? '');
  const confirm = useConfirmEmailChange();
  const user = useCurrentUser();

  const onward = user ? (
    <ButtonLink to={paths.account.getHref()}>Go to your account</ButtonLink>
  ) : (
    <ButtonLink to={paths.auth.signIn.getHref()}>Sign in</ButtonLink>
  );

  return (
    <AuthLayout title="Confirm your new e-mail address">
      {!token.success ? (
        <Alert tone="caution" title="This link is incomplete" role="alert">
          The address may have been cut off when it was copied. Open the link straight from the e-mail.
        </Alert>
      ) : confirm.isSuccess ? (
        <div className="space-y-5">
          <Alert tone="success" title="Your e-mail address has changed">
            From now on you sign in with <strong className="break-all">{confirm.data.email}</strong>, and mail from Underfoot goes there.
          </Alert>
          {onward}
        </div>
      ) : (
        <div className="space-y-5">
          {confirm.isError ? (
            <Alert tone="caution" title="The address was not changed" role="alert">
              {errorMessage(confirm.error)}
            </Alert>
          ) : (
            <p>Confirm that this mailbox is yours. Your account then signs in with this address, and mail from Underfoot comes here.</p>
          )}
          {confirm.isError ? (
            onward
          ) : (
            <Button className="w-full" pending={confirm.isPending} onClick={() => confirm.mutate(token.data)}>
              Confirm my new address
            </Button>
          )}
        </div>
      )}
    </AuthLayout>
  );
}
