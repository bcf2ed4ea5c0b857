import { zodResolver } from '@hookform/resolvers/zod';
import { centsToDollarsText, feeItemFormSchema, type FeeItemFormInput } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { CheckboxField, SelectField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { applyServerFieldErrors } from '@/lib/forms';
import { useSaveFee, type FeeListItem } from '../api';

type Parsed = z.output<typeof feeItemFormSchema>;
const fields = ['kind', 'name', 'description', 'priceCents', 'active'] as const;

export const feeKindLabels = { base: 'Inspection fee', add_on: 'Add-on' } as const;

/** Adding or changing one fee; the price is typed in dollars and checked as cents, like the API. */
export function FeeItemForm({ item, onDone }: { item: FeeListItem | null; onDone: () => void }) {
  const form = useForm<FeeItemFormInput, unknown, Parsed>({
    resolver: zodResolver(feeItemFormSchema),
    defaultValues: item
      ? {
          kind: item.kind,
          name: item.name,
          description: item.description,
          priceCents: centsToDollarsText(item.priceCents),
          active: item.active,
        }
      : { kind: 'add_on', name: '', description: '', priceCents: '', active: true },
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const save = useSaveFee();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    save.mutate(
      { id: item?.id ?? null, item: values },
      {
        onSuccess: (saved) => {
          toast.success(item ? `“${saved.name}” saved. New orders use it from now on.` : `“${saved.name}” added to the fee list.`);
          onDone();
        },
        onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, fields)),
      },
    );
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={item ? `Edit ${item.name}` : 'New fee'}>
      <FormAlert error={save.error} extra={unmatched} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" error={errors.name?.message} {...form.register('name')} />
        <SelectField label="Kind" error={errors.kind?.message} {...form.register('kind')}>
          <option value="base">{feeKindLabels.base}</option>
          <option value="add_on">{feeKindLabels.add_on}</option>
        </SelectField>
        <TextField
          label="Price (USD)"
          inputMode="decimal"
          autoComplete="off"
          hint="For example 325 or 324.50."
          error={errors.priceCents?.message}
          {...form.register('priceCents')}
        />
        <TextField
          label="Description"
          hint="One line the person ordering sees."
          error={errors.description?.message}
          {...form.register('description')}
        />
      </div>
      <CheckboxField
        label="Offered on new orders"
        description="Untick to retire the fee: it disappears from the order form, and orders that already include it keep it."
        error={errors.active?.message}
        {...form.register('active')}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" pending={save.isPending}>
          {item ? 'Save the fee' : 'Add the fee'}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
