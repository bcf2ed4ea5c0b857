import { zodResolver } from '@hookform/resolvers/zod';
import { companySettingsSchema, MAX_SHARE_LINK_DAYS } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { CheckboxField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { applyServerFieldErrors } from '@/lib/forms';
import { useSaveSettings, type Company } from '../api';

const schema = companySettingsSchema.pick({
  requirePaymentBeforeRelease: true,
  inspectorsMayPublish: true,
  shareLinkDays: true,
  guestCostsDefault: true,
});
type Values = z.input<typeof schema>;
type Parsed = z.output<typeof schema>;
const fields = ['requirePaymentBeforeRelease', 'inspectorsMayPublish', 'shareLinkDays', 'guestCostsDefault'] as const;

export function ReportSettingsForm({ company }: { company: Company }) {
  const { requirePaymentBeforeRelease, inspectorsMayPublish, shareLinkDays, guestCostsDefault } = company.settings;
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(schema),
    defaultValues: { requirePaymentBeforeRelease, inspectorsMayPublish, shareLinkDays, guestCostsDefault },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const save = useSaveSettings();
  const { errors, isDirty } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    save.mutate(values, {
      onSuccess: (saved) => {
        form.reset({
          requirePaymentBeforeRelease: saved.settings.requirePaymentBeforeRelease,
          inspectorsMayPublish: saved.settings.inspectorsMayPublish,
          shareLinkDays: saved.settings.shareLinkDays,
          guestCostsDefault: saved.settings.guestCostsDefault,
        });
        toast.success('Report settings saved.');
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, fields)),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      <FormAlert error={save.error} extra={unmatched} />
      <fieldset className="space-y-3">
        <legend className="mb-2 text-sm font-semibold text-ink-muted">Releasing reports</legend>
        <CheckboxField
          label="Hold the report until the fee is paid"
          description="When the client pays before release, the published report stays closed to them until payment arrives."
          error={errors.requirePaymentBeforeRelease?.message}
          {...form.register('requirePaymentBeforeRelease')}
        />
        <CheckboxField
          label="Inspectors may publish their own reports"
          description="Otherwise the office reviews and publishes every report. Inspectors can then also amend what they published."
          error={errors.inspectorsMayPublish?.message}
          {...form.register('inspectorsMayPublish')}
        />
      </fieldset>
      <fieldset className="space-y-3">
        <legend className="mb-2 text-sm font-semibold text-ink-muted">Share links for guests (lenders, insurers, contractors)</legend>
        <TextField
          label="Share links last (days)"
          type="number"
          inputMode="numeric"
          min={1}
          max={MAX_SHARE_LINK_DAYS}
          hint={`The default lifetime of a new share link, from 1 to ${MAX_SHARE_LINK_DAYS} days. Any link can be revoked sooner.`}
          error={errors.shareLinkDays?.message}
          className="max-w-xs"
          {...form.register('shareLinkDays')}
        />
        <CheckboxField
          label="Show repair cost ranges to guests"
          description="The default for new share links; whoever makes a link can still change it for that link."
          error={errors.guestCostsDefault?.message}
          {...form.register('guestCostsDefault')}
        />
      </fieldset>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" pending={save.isPending} disabled={!isDirty}>
          Save the settings
        </Button>
        {isDirty ? <p className="text-sm text-ink-muted">You have unsaved changes.</p> : null}
      </div>
    </form>
  );
}
