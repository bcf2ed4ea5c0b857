import { zodResolver } from '@hookform/resolvers/zod';
import { companyProfileSchema } from '@underfoot/core';
import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { SelectField, TextAreaField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { applyServerFieldErrors } from '@/lib/forms';
import { useSaveProfile, type Company } from '../api';

type Values = z.input<typeof companyProfileSchema>;
type Parsed = z.output<typeof companyProfileSchema>;
const fields = ['name', 'licenceNumber', 'phone', 'email', 'serviceArea', 'reportFooter', 'timeZone'] as const;

/** IANA zones the browser knows, with the company's own first in case the browser lacks it. */
function useTimeZones(current: string): string[] {
  return useMemo(() => {
    const known = typeof Intl.supportedValuesOf === 'function' ? Intl.supportedValuesOf('timeZone') : [];
    return known.includes(current) ? known : [current, ...known];
  }, [current]);
}

export function ProfileForm({ company }: { company: Company }) {
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(companyProfileSchema),
    defaultValues: company.profile,
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const save = useSaveProfile();
  const zones = useTimeZones(company.profile.timeZone);
  const { errors, isDirty } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    save.mutate(values, {
      onSuccess: (saved) => {
        form.reset(saved.profile);
        toast.success('Company profile saved.');
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, fields)),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={save.error} extra={unmatched} />
      <TextField label="Company name" autoComplete="organization" error={errors.name?.message} {...form.register('name')} />
      <div className="grid gap-5 sm:grid-cols-2">
        <TextField
          label="Licence number"
          hint="As it should appear on reports."
          error={errors.licenceNumber?.message}
          {...form.register('licenceNumber')}
        />
        <SelectField label="Time zone" hint="Deadlines and visits use it." error={errors.timeZone?.message} {...form.register('timeZone')}>
          {zones.map((zone) => (
            <option key={zone} value={zone}>
              {zone.replace(/_/g, ' ')}
            </option>
          ))}
        </SelectField>
        <TextField label="Phone" type="tel" autoComplete="tel" error={errors.phone?.message} {...form.register('phone')} />
        <TextField
          label="Office e-mail"
          type="email"
          autoComplete="email"
          inputMode="email"
          autoCapitalize="none"
          spellCheck={false}
          error={errors.email?.message}
          {...form.register('email')}
        />
      </div>
      <TextAreaField
        label="Service area"
        hint="Where you inspect, in your own words; shown to agents."
        error={errors.serviceArea?.message}
        {...form.register('serviceArea')}
      />
      <TextAreaField
        label="Report footer"
        hint="Your line at the foot of every report, below Underfoot’s standard cautions (a camera survey is not a warranty; costs are estimates)."
        rows={4}
        error={errors.reportFooter?.message}
        {...form.register('reportFooter')}
      />
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" pending={save.isPending}>
          Save the profile
        </Button>
        {isDirty ? <p className="text-sm text-ink-muted">You have unsaved changes.</p> : null}
      </div>
    </form>
  );
}
