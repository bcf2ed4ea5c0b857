import { useQuery } from '@tanstack/react-query';
import { tokenSchema } from '@underfoot/core';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { toast } from 'sonner';
import { AuthLayout } from '@/components/layout/auth-layout';
import { Alert } from '@/components/ui/alert';
import { ButtonLink } from '@/components/ui/button';
import { NewAccountForm } from '@/components/ui/new-account-form';
import { SectionLoading } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { homePathOf } from '@/lib/auth';
import { signUpLinkQueryOptions, useCompleteSignUp, type SignUpLink } from '../api';

function ChoosePasswordForm({ token, link }: { token: string; link: SignUpLink }) {
  const navigate = useNavigate();
  const complete = useCompleteSignUp({
    onSuccess: (user) => {
      toast.success(`Welcome to Underfoot, ${user.name}.`);
      void navigate(homePathOf(user.role), { replace: true });
    },
  });
  return (
    <NewAccountForm
      email={link.email}
      defaultName={link.name}
      error={complete.error}
      pending={complete.isPending}
      onSubmit={(values, callbacks) => complete.mutate({ token, ...values }, callbacks)}
    />
  );
}

function VerifyBody({ token }: { token: string }) {
  const link = useQuery(signUpLinkQueryOptions(token));
  if (link.isPending) return <SectionLoading label="Opening your link…" />;
  if (link.isError) {
    const known = isApiError(link.error, 404) || isApiError(link.error, 410);
    return (
      <div className="space-y-5">
        <Alert tone="caution" title={known ? 'This link cannot be used' : 'The link could not be opened'} role="alert">
          <p>{errorMessage(link.error)}</p>
        </Alert>
        <ButtonLink to={paths.auth.signIn.getHref()} variant="secondary">
          Go to sign in
        </ButtonLink>
      </div>
    );
  }
  return (
    <div className="space-y-6">
      <p>
        Your address is confirmed for <strong>{link.data.companyName}</strong>. Choose a password to finish.
      </p>
      <ChoosePasswordForm token={token} link={link.data} />
    </div>
  );
}

export function VerifySignUpRoute() {
  const [params] = useSearchParams();
  const token = tokenSchema.safeParse(params.get('token') ?? '');
  return (
    <AuthLayout title="Finish signing up">
      {token.success ? (
        <VerifyBody token={token.data} />
      ) : (
        <Alert tone="caution" title="This link is incomplete" role="alert">
          The address may have been cut off when it was copied. Open the link straight from the e-mail.
        </Alert>
      )}
    </AuthLayout>
  );
}
