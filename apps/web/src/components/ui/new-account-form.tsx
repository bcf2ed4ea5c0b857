import { zodResolver } from '@hookform/resolvers/zod';
import { invitationAcceptSchema } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { applyServerFieldErrors } from '@/lib/forms';
import { Button } from './button';
import { FormAlert } from './form-alert';
import { PasswordField, passwordHint, TextField } from './text-field';

// Accepting an invitation and finishing an agent's sign-up ask the same two things
// (core's invitationAcceptSchema and agentSignUpCompleteSchema share their name and password rules).
const schema = invitationAcceptSchema.pick({ name: true, password: true });
type Values = z.input<typeof schema>;
export type NewAccountValues = z.output<typeof schema>;

/**
 * The last step of a new account that came by e-mail link: the address (fixed by
 * the link), the person's name and a password of their own. The caller sends
 * them; field errors from the server land on the fields.
 */
export function NewAccountForm({
  email,
  emailNote,
  defaultName,
  error,
  pending,
  onSubmit,
}: {
  email: string;
  /** A line under the address, e.g. that it is the one to sign in with. */
  emailNote?: string;
  defaultName: string;
  /** The send's error, for the alert above the form. */
  error: unknown;
  pending: boolean;
  onSubmit: (values: NewAccountValues, callbacks: { onError: (error: unknown) => void }) => void;
}) {
  const form = useForm<Values, unknown, NewAccountValues>({
    resolver: zodResolver(schema),
    defaultValues: { name: defaultName, password: '' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const { errors } = form.formState;

  const submit = form.handleSubmit((values) => {
    setUnmatched([]);
    onSubmit(values, { onError: (e) => setUnmatched(applyServerFieldErrors(e, form.setError, ['name', 'password'])) });
  });

  return (
    <form onSubmit={submit} noValidate className="space-y-5">
      <FormAlert error={error} extra={unmatched} />
      <div className="space-y-1.5">
        <p className="text-sm font-semibold">E-mail address</p>
        <p className="rounded-lg border border-line bg-sand px-3 py-2.5 break-all">{email}</p>
        {emailNote ? <p className="text-sm text-ink-muted">{emailNote}</p> : null}
      </div>
      {/* Lets password managers store the new password under the right address. */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...form.register('name')} />
      <PasswordField
        label="Choose a password"
        autoComplete="new-password"
        hint={passwordHint}
        error={errors.password?.message}
        {...form.register('password')}
      />
      <Button type="submit" className="w-full" pending={pending}>
        Create my account
      </Button>
    </form>
  );
}
