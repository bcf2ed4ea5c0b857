import { zodResolver } from '@hookform/resolvers/zod';
import { invitationCreateSchema } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { SelectField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { roleLabels } from '@/config/roles';
import { applyServerFieldErrors } from '@/lib/forms';
import { useInvite } from '../api';

type Values = z.input<typeof invitationCreateSchema>;
type Parsed = z.output<typeof invitationCreateSchema>;

/** Buyers and sellers join through the orders they are on, so the office invites staff and agents here. */
const invitableRoles = ['inspector', 'office', 'agent'] as const;

export function InviteForm() {
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(invitationCreateSchema),
    defaultValues: { name: '', email: '', role: 'inspector' },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const invite = useInvite();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    invite.mutate(values, {
      onSuccess: () => {
        toast.success(`Invitation sent to ${values.email}.`);
        form.reset({ name: '', email: '', role: values.role });
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['name', 'email', 'role'])),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormAlert error={invite.error} extra={unmatched} />
      <div className="grid gap-4 md:grid-cols-[minmax(0,1fr)_minmax(0,1.3fr)_minmax(0,0.8fr)_auto] md:items-start">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
        <TextField
          label="E-mail address"
          type="email"
          inputMode="email"
          autoCapitalize="none"
          spellCheck={false}
          autoComplete="off"
          error={errors.email?.message}
          {...form.register('email')}
        />
        <SelectField label="Role" error={errors.role?.message} {...form.register('role')}>
          {invitableRoles.map((role) => (
            <option key={role} value={role}>
              {roleLabels[role]}
            </option>
          ))}
        </SelectField>
        <div className="md:pt-7">
          <Button type="submit" pending={invite.isPending} className="w-full md:w-auto">
            Send invitation
          </Button>
        </div>
      </div>
      <p className="text-sm text-ink-muted">
        They get an e-mail with a link to choose a password; the link works for 7 days and you can send a fresh one from the list below.
      </p>
    </form>
  );
}
