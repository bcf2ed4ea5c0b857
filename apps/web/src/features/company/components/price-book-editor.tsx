import { zodResolver } from '@hookform/resolvers/zod';
import {
  demoPriceBook,
  priceBookFormSchema,
  priceBookToFormValues,
  priceItemGroups,
  priceItemKeys,
  priceUnitNames,
  type PriceBook,
  type PriceBookFormValues,
  type PriceItemKey,
} from '@underfoot/core';
import { useMemo, useState } from 'react';
import { useForm, useWatch, type FieldErrors, type Path, type UseFormRegister } from 'react-hook-form';
import { toast } from 'sonner';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field-error';
import { FormAlert } from '@/components/ui/form-alert';
import { inputClasses, TextField } from '@/components/ui/text-field';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import { applyServerFieldErrors } from '@/lib/forms';
import { useSavePriceBook, type StoredPriceBook } from '../api';
import { Section } from './company-page';
import { PriceBookPreview } from './price-book-preview';

type Values = PriceBookFormValues;

/** Every field path the API can report on, so its errors land on the right cell. */
const fieldPaths: Path<Values>[] = [
  'regionalFactor',
  'depth.includedDepth',
  'depth.extraPercentPerFootLow',
  'depth.extraPercentPerFootHigh',
  ...priceItemKeys.flatMap((key) =>
    (['label', 'unit', 'lowCents', 'highCents', 'note'] as const).map((field) => `items.${key}.${field}` as Path<Values>),
  ),
];

function Cell({
  name,
  label,
  register,
  error,
  className,
  numeric,
  deps,
}: {
  name: Path<Values>;
  label: string;
  register: UseFormRegister<Values>;
  error: string | undefined;
  className?: string;
  numeric?: boolean;
  /** A field checked against this one (low and high), re-validated when this one changes. */
  deps?: Path<Values>;
}) {
  const errorId = `${name}-error`;
  return (
    <div className="space-y-1">
      <input
        aria-label={label}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? errorId : undefined}
        inputMode={numeric ? 'decimal' : undefined}
        autoComplete="off"
        className={cn(inputClasses, 'min-h-9 px-2 py-1 text-sm', numeric && 'numeric text-right', className)}
        {...register(name, deps ? { deps } : {})}
      />
      <FieldError id={errorId} message={error} />
    </div>
  );
}

function itemErrors(errors: FieldErrors<Values>, key: PriceItemKey) {
  const item = errors.items?.[key];
  return {
    label: item?.label?.message,
    unit: item?.unit?.message,
    low: item?.lowCents?.message,
    high: item?.highCents?.message,
    note: item?.note?.message,
  };
}

/**
 * The price book as a table: each item's name, its fixed unit, the low and
 * high unit prices and where they came from; then the regional factor and the
 * depth rule. The preview beside it recomputes the sample's cost options on
 * every keystroke.
 */
export function PriceBookEditor({ stored }: { stored: StoredPriceBook }) {
  const savedValues = useMemo(() => priceBookToFormValues(stored.priceBook), [stored.priceBook]);
  const form = useForm<Values, unknown, PriceBook>({
    resolver: zodResolver(priceBookFormSchema),
    defaultValues: savedValues,
    mode: 'onChange',
  });
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const save = useSavePriceBook();
  const { errors, isDirty } = form.formState;
  const register = form.register;

  // The preview reads the live values; a value that does not parse yet shows no new range.
  const watched = useWatch({ control: form.control });
  const edited = useMemo(() => {
    const parsed = priceBookFormSchema.safeParse(watched);
    return parsed.success ? parsed.data : null;
  }, [watched]);

  const onSubmit = form.handleSubmit((book) => {
    setUnmatched([]);
    save.mutate(book, {
      onSuccess: (result) => {
        form.reset(priceBookToFormValues(result.priceBook));
        toast.success('Price book saved. Reports not yet published use it from now on.');
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, fieldPaths)),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <FormAlert error={save.error} extra={unmatched} />
      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1fr)_21rem]">
        <div className="min-w-0 space-y-6">
          <Section
            title="Items"
            description="Prices per unit, before the regional factor. The unit is fixed by how the cost ranges count quantities."
          >
            {/* A table on wide screens; on a phone each item stacks into a small card of its own. */}
            <table className="block w-full border-collapse text-left text-sm md:table md:table-fixed">
              <caption className="sr-only">Price book items</caption>
              <thead className="hidden text-ink-muted md:table-header-group">
                <tr className="border-b border-line">
                  <th scope="col" className="w-[30%] py-2 pr-2 font-semibold">
                    Item
                  </th>
                  <th scope="col" className="w-28 px-2 py-2 font-semibold">
                    Unit
                  </th>
                  <th scope="col" className="w-24 px-2 py-2 text-right font-semibold">
                    Low ($)
                  </th>
                  <th scope="col" className="w-24 px-2 py-2 text-right font-semibold">
                    High ($)
                  </th>
                  <th scope="col" className="py-2 pl-2 font-semibold">
                    Source or note
                  </th>
                </tr>
              </thead>
              {priceItemGroups.map((group) => (
                <tbody key={group.title} className="block md:table-row-group">
                  <tr className="block md:table-row">
                    <th
                      colSpan={5}
                      scope="colgroup"
                      className="block pt-4 pb-1 text-xs font-semibold tracking-wide text-brand uppercase md:table-cell"
                    >
                      {group.title}
                    </th>
                  </tr>
                  {group.items.map((key) => {
                    const e = itemErrors(errors, key);
                    const label = stored.priceBook.items[key].label;
                    const unit = priceUnitNames[stored.priceBook.items[key].unit].per;
                    return (
                      <tr
                        key={key}
                        className="grid grid-cols-2 gap-x-3 gap-y-2 border-b border-line py-3 align-top last:border-b-0 md:table-row md:py-0"
                        data-item={key}
                      >
                        <td className="col-span-2 md:table-cell md:py-2 md:pr-2">
                          <Cell name={`items.${key}.label`} label={`Name of ${label}`} register={register} error={e.label} />
                        </td>
                        <td className="col-span-2 text-ink-muted md:table-cell md:px-2 md:py-2 md:pt-3.5">
                          <span className="md:hidden">Priced </span>
                          {unit}
                          <FieldError message={e.unit} />
                        </td>
                        <td className="md:table-cell md:px-2 md:py-2">
                          <span aria-hidden="true" className="mb-1 block text-xs font-semibold text-ink-muted md:hidden">
                            Low ($)
                          </span>
                          <Cell
                            name={`items.${key}.lowCents`}
                            label={`${label}, low price`}
                            register={register}
                            error={e.low}
                            deps={`items.${key}.highCents`}
                            numeric
                          />
                        </td>
                        <td className="md:table-cell md:px-2 md:py-2">
                          <span aria-hidden="true" className="mb-1 block text-xs font-semibold text-ink-muted md:hidden">
                            High ($)
                          </span>
                          <Cell
                            name={`items.${key}.highCents`}
                            label={`${label}, high price`}
                            register={register}
                            error={e.high}
                            deps={`items.${key}.lowCents`}
                            numeric
                          />
                        </td>
                        <td className="col-span-2 md:table-cell md:py-2 md:pl-2">
                          <Cell name={`items.${key}.note`} label={`${label}, source or note`} register={register} error={e.note} />
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              ))}
            </table>
          </Section>

          <Section title="Local market and depth">
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField
                label="Regional factor"
                inputMode="decimal"
                hint="Multiplies every price: 1 as listed, 1.15 for 15 % more."
                error={errors.regionalFactor?.message}
                {...register('regionalFactor')}
              />
              <TextField
                label="Dig depth included in the prices"
                hint={'Feet and inches, like 5\' 0" or 5 ft.'}
                error={errors.depth?.includedDepth?.message}
                {...register('depth.includedDepth')}
              />
              <TextField
                label="Extra per foot deeper, low (%)"
                inputMode="numeric"
                hint="Of the dig price, for each foot below that depth."
                error={errors.depth?.extraPercentPerFootLow?.message}
                {...register('depth.extraPercentPerFootLow', { deps: 'depth.extraPercentPerFootHigh' })}
              />
              <TextField
                label="Extra per foot deeper, high (%)"
                inputMode="numeric"
                hint="Must not be below the low percentage."
                error={errors.depth?.extraPercentPerFootHigh?.message}
                {...register('depth.extraPercentPerFootHigh', { deps: 'depth.extraPercentPerFootLow' })}
              />
            </div>
          </Section>
        </div>

        <div className="min-w-0 lg:sticky lg:top-20">
          <Section title="Preview on a sample inspection" description="Nothing is saved until you press Save.">
            <PriceBookPreview saved={stored.priceBook} edited={edited} />
          </Section>
        </div>
      </div>

      <div className="flex flex-wrap items-center gap-3 md:sticky md:bottom-0 md:z-10 md:rounded-card md:border md:border-line md:bg-paper/95 md:px-4 md:py-3 md:backdrop-blur">
        <Button type="submit" pending={save.isPending} disabled={!isDirty}>
          Save the price book
        </Button>
        <Button variant="secondary" disabled={!isDirty || save.isPending} onClick={() => form.reset(savedValues)}>
          Undo changes
        </Button>
        <Button
          variant="quiet"
          disabled={save.isPending}
          onClick={() => form.reset(priceBookToFormValues(demoPriceBook), { keepDefaultValues: true })}
        >
          Start from the documented defaults
        </Button>
        <p className="text-sm text-ink-muted">
          {isDirty
            ? 'Unsaved changes.'
            : stored.isDefault
              ? 'Using Underfoot’s documented defaults.'
              : `Saved ${stored.updatedAt ? formatDateTime(stored.updatedAt) : ''}${stored.updatedBy ? ` by ${stored.updatedBy.name}` : ''}.`}
        </p>
      </div>
    </form>
  );
}
