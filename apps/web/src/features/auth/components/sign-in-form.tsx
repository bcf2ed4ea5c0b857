import { zodResolver } from '@hookform/resolvers/zod';
import { signInSchema, type CurrentUser } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { PasswordField, TextField } from '@/components/ui/text-field';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/forms';
import { useSignIn } from '../api';

type SignInValues = z.input<typeof signInSchema>;
type SignInParsed = z.output<typeof signInSchema>;

export function SignInForm({ onSignedIn }: { onSignedIn: (user: CurrentUser) => void }) {
  const form = useForm<SignInValues, unknown, SignInParsed>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: '', password: '' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const signIn = useSignIn({ onSuccess: onSignedIn });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    signIn.mutate(values, {
      onError: (error) => {
        setUnmatched(applyServerFieldErrors(error, form.setError, ['email', 'password']));
        if (isApiError(error, 401)) {
          // Wrong e-mail or password: keep the address, start the password again.
          form.resetField('password');
          form.setFocus('password');
        }
      },
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={signIn.error} extra={unmatched} />
      <TextField
        label="E-mail address"
        type="email"
        autoComplete="username"
        inputMode="email"
        autoCapitalize="none"
        spellCheck={false}
        error={errors.email?.message}
        {...form.register('email')}
      />
      <div className="space-y-2">
        <PasswordField label="Password" autoComplete="current-password" error={errors.password?.message} {...form.register('password')} />
        <p className="text-sm">
          <Link to={paths.auth.forgotPassword.getHref()} className="font-medium underline underline-offset-2">
            Forgot your password?
          </Link>
        </p>
      </div>
      <Button type="submit" className="w-full" pending={signIn.isPending}>
        {signIn.isPending ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}
