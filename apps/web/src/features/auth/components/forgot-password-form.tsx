import { zodResolver } from '@hookform/resolvers/zod';
import { passwordResetRequestSchema } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { TextField } from '@/components/ui/text-field';
import { applyServerFieldErrors } from '@/lib/forms';
import { useRequestPasswordReset } from '../api';

type Values = z.input<typeof passwordResetRequestSchema>;
type Parsed = z.output<typeof passwordResetRequestSchema>;

export function ForgotPasswordForm() {
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(passwordResetRequestSchema),
    defaultValues: { email: '' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const request = useRequestPasswordReset();

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    request.mutate(values, {
      onSuccess: () => setSentTo(values.email),
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['email'])),
    });
  });

  if (sentTo) {
    return (
      <div className="space-y-5">
        <Alert tone="success" title="Check your e-mail">
          <p>
            If an account exists for that address, we have sent a link to <strong className="break-all">{sentTo}</strong>. The link works
            once and for a limited time.
          </p>
        </Alert>
        <p className="text-sm text-ink-muted">
          Nothing arrived after a few minutes? Check the spam folder, or{' '}
          <button
            type="button"
            className="font-medium text-accent underline underline-offset-2"
            onClick={() => {
              setSentTo(null);
              request.reset();
            }}
          >
            try another address
          </button>
          .
        </p>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={request.error} extra={unmatched} />
      <TextField
        label="E-mail address"
        type="email"
        autoComplete="email"
        inputMode="email"
        autoCapitalize="none"
        spellCheck={false}
        error={form.formState.errors.email?.message}
        {...form.register('email')}
      />
      <Button type="submit" className="w-full" pending={request.isPending}>
        Send me a link
      </Button>
    </form>
  );
}
