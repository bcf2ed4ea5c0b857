import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { agentSignUpSchema } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useParams } from 'react-router-dom';
import type { z } from 'zod';
import { AuthLayout } from '@/components/layout/auth-layout';
import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { SectionLoading } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { paths } from '@/config/paths';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useCurrentUser } from '@/lib/auth';
import { applyServerFieldErrors } from '@/lib/forms';
import { signUpPageQueryOptions, useRequestSignUp, type SignUpPage } from '../api';

type Values = z.input<typeof agentSignUpSchema>;
type Parsed = z.output<typeof agentSignUpSchema>;

function SignUpForm({ page }: { page: SignUpPage }) {
  const form = useForm<Values, unknown, Parsed>({ resolver: zodResolver(agentSignUpSchema), defaultValues: { name: '', email: '' } });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const request = useRequestSignUp(page.companyId);
  const { errors } = form.formState;

  if (request.isSuccess) {
    return (
      <Alert tone="success" title="Check your inbox">
        <p>{request.data.detail}</p>
        <p className="mt-1">The link works for 48 hours. If nothing arrives within a few minutes, look in the spam folder.</p>
      </Alert>
    );
  }

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    request.mutate(values, { onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['name', 'email'])) });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={request.error} extra={unmatched} />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...form.register('name')} />
      <TextField
        label="Work e-mail address"
        type="email"
        inputMode="email"
        autoCapitalize="none"
        spellCheck={false}
        autoComplete="email"
        hint="We send a link there to confirm it; then you choose a password."
        error={errors.email?.message}
        {...form.register('email')}
      />
      <Button type="submit" className="w-full" pending={request.isPending}>
        Send me the link
      </Button>
    </form>
  );
}

/** A company's public sign-up page for agents, open while the office allows it. */
export function AgentSignUpRoute() {
  const { companyId = '' } = useParams();
  const page = useQuery(signUpPageQueryOptions(companyId));
  const user = useCurrentUser();

  const title = page.data ? `Join ${page.data.companyName} as an agent` : 'Sign up as an agent';
  return (
    <AuthLayout
      title={title}
      description={
        page.data ? 'Order sewer line camera inspections for your buyers and sellers, and read the reports on any device.' : undefined
      }
      footer={
        <p>
          Already have an account?{' '}
          <a href={paths.auth.signIn.getHref()} className="font-medium underline underline-offset-2">
            Sign in
          </a>
        </p>
      }
    >
      {page.isPending ? (
        <SectionLoading />
      ) : page.isError ? (
        <Alert
          tone="caution"
          title={isApiError(page.error, 404) ? 'Sign-up is not open here' : 'This page could not be loaded'}
          role="alert"
        >
          <p>
            {isApiError(page.error, 404)
              ? 'This company takes new agents by invitation. Ask its office to invite you, or check the address you were given.'
              : errorMessage(page.error)}
          </p>
        </Alert>
      ) : (
        <div className="space-y-5">
          {page.data.logoUrl ? (
            <img src={page.data.logoUrl} alt={`${page.data.companyName} logo`} className="max-h-16 w-auto max-w-full" />
          ) : null}
          {user ? (
            <Alert tone="info" title={`You are signed in as ${user.name}`}>
              <p>Sign out first to make another account.</p>
              <ButtonLink to={paths.home.getHref()} variant="secondary" size="sm" className="mt-2">
                Back to Underfoot
              </ButtonLink>
            </Alert>
          ) : (
            <SignUpForm page={page.data} />
          )}
        </div>
      )}
    </AuthLayout>
  );
}
