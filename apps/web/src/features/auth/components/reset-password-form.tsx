import { zodResolver } from '@hookform/resolvers/zod';
import { passwordResetCompleteSchema, type CurrentUser } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { PasswordField, passwordHint } from '@/components/ui/text-field';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/forms';
import { useCompletePasswordReset } from '../api';

// The token comes from the link, not from a field.
const schema = passwordResetCompleteSchema.pick({ password: true });
type Values = z.input<typeof schema>;
type Parsed = z.output<typeof schema>;

export function ResetPasswordForm({ token, onDone }: { token: string; onDone: (user: CurrentUser) => void }) {
  const form = useForm<Values, unknown, Parsed>({ resolver: zodResolver(schema), defaultValues: { password: '' } });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const reset = useCompletePasswordReset({ onSuccess: onDone });
  // 410: used or expired; 400 with a token error: damaged. Either way a new link is the way out.
  const linkUnusable =
    isApiError(reset.error, 410) || (isApiError(reset.error, 400) && reset.error.fieldErrors.some((e) => e.path === 'token'));

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    reset.mutate(
      { token, password: values.password },
      { onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['password'])) },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={reset.error} extra={unmatched} />
      {linkUnusable ? (
        <p className="text-sm">
          <Link to={paths.auth.forgotPassword.getHref()} className="font-medium underline underline-offset-2">
            Request a new link
          </Link>
        </p>
      ) : null}
      <PasswordField
        label="New password"
        autoComplete="new-password"
        hint={passwordHint}
        error={form.formState.errors.password?.message}
        {...form.register('password')}
      />
      <Button type="submit" className="w-full" pending={reset.isPending}>
        Save the new password and sign in
      </Button>
    </form>
  );
}
