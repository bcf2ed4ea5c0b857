import { tokenSchema } from '@underfoot/core';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { toast } from 'sonner';
import { AuthLayout } from '@/components/layout/auth-layout';
import { ButtonLink } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { homePathOf } from '@/lib/auth';
import { LinkProblem } from '../components/link-problem';
import { ResetPasswordForm } from '../components/reset-password-form';

export function ResetPasswordRoute() {
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const token = tokenSchema.safeParse(searchParams.get('token') ?? '');

  return (
    <AuthLayout title="Choose a new password">
      {token.success ? (
        <ResetPasswordForm
          token={token.data}
          onDone={(user) => {
            toast.success('Your new password is saved. You are signed in.');
            void navigate(homePathOf(user.role), { replace: true });
          }}
        />
      ) : (
        <LinkProblem
          title="This link is incomplete"
          action={<ButtonLink to={paths.auth.forgotPassword.getHref()}>Request a new link</ButtonLink>}
        >
          <p>
            The address may have been cut off when it was copied from the e-mail. Open the link straight from the e-mail, or ask for a new
            one.
          </p>
        </LinkProblem>
      )}
    </AuthLayout>
  );
}
