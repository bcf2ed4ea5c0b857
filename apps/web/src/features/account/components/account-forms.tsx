import { zodResolver } from '@hookform/resolvers/zod';
import { accountNameSchema, emailChangeSchema, passwordChangeSchema, type CurrentUser } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { PasswordField, passwordHint, TextField } from '@/components/ui/text-field';
import { formatDateTime } from '@/lib/format';
import { applyServerFieldErrors } from '@/lib/forms';
import { useChangeName, useChangePassword, useRequestEmailChange, useSignOutOthers, type AccountOverview } from '../api';

export function NameForm({ user }: { user: CurrentUser }) {
  type Values = z.input<typeof accountNameSchema>;
  const form = useForm<Values, unknown, z.output<typeof accountNameSchema>>({
    resolver: zodResolver(accountNameSchema),
    defaultValues: { name: user.name },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const change = useChangeName();

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    change.mutate(values, {
      onSuccess: (saved) => {
        form.reset({ name: saved.name });
        toast.success('Your name is saved.');
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['name'])),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormAlert error={change.error} extra={unmatched} />
      <TextField
        label="Your name"
        autoComplete="name"
        hint="As it appears to your company and on orders."
        error={form.formState.errors.name?.message}
        {...form.register('name')}
      />
      <Button type="submit" pending={change.isPending} disabled={!form.formState.isDirty}>
        Save the name
      </Button>
    </form>
  );
}

export function EmailForm({ overview }: { overview: AccountOverview }) {
  type Values = z.input<typeof emailChangeSchema>;
  const form = useForm<Values, unknown, z.output<typeof emailChangeSchema>>({
    resolver: zodResolver(emailChangeSchema),
    defaultValues: { newEmail: '', currentPassword: '' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const request = useRequestEmailChange();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    request.mutate(values, {
      onSuccess: () => {
        form.reset({ newEmail: '', currentPassword: '' });
        toast.success(`We sent a confirmation link to ${values.newEmail}.`);
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['newEmail', 'currentPassword'])),
    });
  });

  return (
    <div className="space-y-4">
      <p>
        You sign in with <strong className="break-all">{overview.user.email}</strong>.
      </p>
      {overview.pendingEmail ? (
        <Alert tone="info" title="Waiting for confirmation">
          We sent a link to <strong className="break-all">{overview.pendingEmail.newEmail}</strong>. Your address changes when you open it
          (before {formatDateTime(overview.pendingEmail.expiresAt)}). Until then, keep signing in with your current address.
        </Alert>
      ) : null}
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormAlert error={request.error} extra={unmatched} />
        <TextField
          label="New e-mail address"
          type="email"
          inputMode="email"
          autoCapitalize="none"
          spellCheck={false}
          autoComplete="email"
          error={errors.newEmail?.message}
          {...form.register('newEmail')}
        />
        <PasswordField
          label="Current password"
          autoComplete="current-password"
          hint="So nobody else at this screen can move your account."
          error={errors.currentPassword?.message}
          {...form.register('currentPassword')}
        />
        <Button type="submit" pending={request.isPending}>
          Send a confirmation link
        </Button>
      </form>
    </div>
  );
}

export function PasswordForm({ user }: { user: CurrentUser }) {
  type Values = z.input<typeof passwordChangeSchema>;
  const form = useForm<Values, unknown, z.output<typeof passwordChangeSchema>>({
    resolver: zodResolver(passwordChangeSchema),
    defaultValues: { currentPassword: '', newPassword: '' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const change = useChangePassword();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    change.mutate(values, {
      onSuccess: ({ otherSessionsEnded }) => {
        form.reset({ currentPassword: '', newPassword: '' });
        toast.success(
          otherSessionsEnded > 0
            ? `Password changed. ${otherSessionsEnded} other ${otherSessionsEnded === 1 ? 'device was' : 'devices were'} signed out.`
            : 'Password changed.',
        );
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['currentPassword', 'newPassword'])),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormAlert error={change.error} extra={unmatched} />
      {/* Lets password managers file the new password under the right account. */}
      <input type="email" name="username" autoComplete="username" value={user.email} readOnly hidden />
      <PasswordField
        label="Current password"
        autoComplete="current-password"
        error={errors.currentPassword?.message}
        {...form.register('currentPassword')}
      />
      <PasswordField
        label="New password"
        autoComplete="new-password"
        hint={passwordHint}
        error={errors.newPassword?.message}
        {...form.register('newPassword')}
      />
      <Button type="submit" pending={change.isPending}>
        Change the password
      </Button>
      <p className="text-sm text-ink-muted">Your other devices are signed out; this one stays signed in.</p>
    </form>
  );
}

export function SessionsCard({ overview }: { overview: AccountOverview }) {
  const signOut = useSignOutOthers();
  const others = overview.otherSessions;
  return (
    <div className="space-y-4">
      <p>
        {others === 0
          ? 'You are signed in on this device only.'
          : `You are also signed in on ${others} other ${others === 1 ? 'device or browser' : 'devices or browsers'}.`}
      </p>
      <Button
        variant="secondary"
        disabled={others === 0}
        pending={signOut.isPending}
        onClick={() =>
          signOut.mutate(undefined, {
            onSuccess: ({ ended }) =>
              toast.success(
                ended > 0 ? `Signed out of ${ended} other ${ended === 1 ? 'device' : 'devices'}.` : 'No other device was signed in.',
              ),
          })
        }
      >
        Sign out of other devices
      </Button>
      <p className="text-sm text-ink-muted">Use this after signing in on a shared or lost phone or computer.</p>
    </div>
  );
}
