import { zodResolver } from '@hookform/resolvers/zod';
import { invitationAcceptSchema, type CurrentUser } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { PasswordField, TextField } from '@/components/ui/text-field';
import { applyServerFieldErrors } from '@/lib/forms';
import { useAcceptInvitation, type Invitation } from '../api';
import { passwordHint } from './reset-password-form';

const schema = invitationAcceptSchema.pick({ name: true, password: true });
type Values = z.input<typeof schema>;
type Parsed = z.output<typeof schema>;

export function AcceptInvitationForm({
  token,
  invitation,
  onDone,
}: {
  token: string;
  invitation: Invitation;
  onDone: (user: CurrentUser) => void;
}) {
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(schema),
    defaultValues: { name: invitation.name, password: '' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const accept = useAcceptInvitation({ onSuccess: onDone });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    accept.mutate(
      { token, ...values },
      { onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['name', 'password'])) },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={accept.error} extra={unmatched} />
      <div className="space-y-1.5">
        <p className="text-sm font-semibold">E-mail address</p>
        <p className="rounded-lg border border-line bg-sand px-3 py-2.5 break-all">{invitation.email}</p>
        <p className="text-sm text-ink-muted">You will sign in with this address.</p>
      </div>
      {/* Lets password managers store the new password under the right address. */}
      <input type="email" name="username" autoComplete="username" value={invitation.email} readOnly hidden />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...form.register('name')} />
      <PasswordField
        label="Choose a password"
        autoComplete="new-password"
        hint={passwordHint}
        error={errors.password?.message}
        {...form.register('password')}
      />
      <Button type="submit" className="w-full" pending={accept.isPending}>
        Create my account
      </Button>
    </form>
  );
}
