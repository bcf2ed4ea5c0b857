import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { makeScheduleSchema, type ArrivalWindow, type ScheduleInput } from '@underfoot/core';
import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { SelectField, TextAreaField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/forms';
import { inspectorsQueryOptions, useScheduleOrder, type OrderDetail } from '../api';
import { formatDay, localTodayIso } from './order-format';

type Parsed = z.output<ReturnType<typeof makeScheduleSchema>>;

// A two-hour arrival window is the usual promise for a home visit; the office can change it.
const DEFAULT_WINDOW = { startTime: '08:00', endTime: '10:00' } as const;

function firstUsableDate(preferred: readonly string[], today: string): string {
  return preferred.find((d) => d >= today) ?? '';
}

/**
 * Assign an inspector and an arrival window (first time or again). The parties
 * and the inspector are e-mailed by the server; the history records the change.
 */
export function ScheduleForm({
  order,
  onDone,
  onCancel,
}: {
  order: Pick<OrderDetail, 'id' | 'status' | 'inspector' | 'window' | 'preferredDates'>;
  onDone?: () => void;
  onCancel?: () => void;
}) {
  const today = localTodayIso();
  const schema = useMemo(() => makeScheduleSchema(today), [today]);
  const inspectors = useQuery(inspectorsQueryOptions());
  const schedule = useScheduleOrder(order.id);
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const current: ArrivalWindow | null = order.window;
  const form = useForm<ScheduleInput, unknown, Parsed>({
    resolver: zodResolver(schema),
    defaultValues: {
      inspectorId: order.inspector?.id ?? '',
      window: current ?? { date: firstUsableDate(order.preferredDates, today), ...DEFAULT_WINDOW },
      note: '',
    },
  });
  const { errors } = form.formState;
  const rescheduling = order.status === 'scheduled';

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    schedule.mutate(values, {
      onSuccess: (updated) => {
        toast.success(
          `${rescheduling ? 'Rescheduled' : 'Scheduled'}: ${updated.inspector?.name ?? 'the inspector'} on ${
            updated.window ? formatDay(updated.window.date) : ''
          }. Everyone on the order has been e-mailed.`,
        );
        onDone?.();
      },
      onError: (error) =>
        setUnmatched(
          applyServerFieldErrors(error, form.setError, ['inspectorId', 'window.date', 'window.startTime', 'window.endTime', 'note']),
        ),
    });
  });

  if (inspectors.isError) {
    return (
      <Alert tone="danger" title="The inspectors could not be loaded">
        <p>{errorMessage(inspectors.error)}</p>
        <Button size="sm" variant="secondary" className="mt-2" onClick={() => void inspectors.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormAlert error={schedule.error} extra={unmatched} />
      {order.preferredDates.length > 0 ? (
        <p className="text-sm text-ink-muted">
          Preferred: <span className="numeric">{order.preferredDates.map(formatDay).join(' · ')}</span>
        </p>
      ) : null}
      <SelectField label="Inspector" error={errors.inspectorId?.message} disabled={inspectors.isPending} {...form.register('inspectorId')}>
        <option value="">{inspectors.isPending ? 'Loading…' : 'Choose an inspector…'}</option>
        {inspectors.data?.map((inspector) => (
          <option key={inspector.id} value={inspector.id}>
            {inspector.name}
          </option>
        ))}
      </SelectField>
      {inspectors.data?.length === 0 ? (
        <Alert tone="caution">No inspector has an active account yet: one can be assigned once they accept their invitation.</Alert>
      ) : null}
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-[1.4fr_1fr_1fr]">
        <TextField
          type="date"
          label="Visit date"
          min={today}
          className="col-span-2 sm:col-span-1"
          error={errors.window?.date?.message}
          {...form.register('window.date')}
        />
        <TextField
          type="time"
          label="Arrive from"
          step={900}
          error={errors.window?.startTime?.message}
          {...form.register('window.startTime')}
        />
        <TextField type="time" label="Arrive by" step={900} error={errors.window?.endTime?.message} {...form.register('window.endTime')} />
      </div>
      <TextAreaField
        label={
          <>
            Note to everyone <span className="font-normal text-ink-muted">(optional)</span>
          </>
        }
        hint="Goes into the e-mail to the parties and the inspector."
        rows={2}
        error={errors.note?.message}
        {...form.register('note')}
      />
      <div className="flex flex-col-reverse gap-2 sm:flex-row sm:justify-end">
        {onCancel ? (
          <Button variant="secondary" onClick={onCancel} disabled={schedule.isPending}>
            Close
          </Button>
        ) : null}
        <Button type="submit" pending={schedule.isPending}>
          {rescheduling ? 'Save the new time' : 'Schedule the visit'}
        </Button>
      </div>
    </form>
  );
}
