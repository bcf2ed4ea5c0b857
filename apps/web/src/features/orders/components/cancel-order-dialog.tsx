import { zodResolver } from '@hookform/resolvers/zod';
import { cancelOrderSchema, formatMoney } from '@underfoot/core';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { toast } from 'sonner';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { FormAlert } from '@/components/ui/form-alert';
import { TextAreaField } from '@/components/ui/form-fields';
import { applyServerFieldErrors } from '@/lib/forms';
import { useCancelOrder } from '../api';

type Values = z.input<typeof cancelOrderSchema>;
type Parsed = z.output<typeof cancelOrderSchema>;

export interface CancelTarget {
  id: string;
  address: string;
  paymentState: 'unpaid' | 'paid' | 'refunded';
  feeTotalCents: number;
}

function CancelForm({ order, onDone, onClose }: { order: CancelTarget; onDone: () => void; onClose: () => void }) {
  const form = useForm<Values, unknown, Parsed>({ resolver: zodResolver(cancelOrderSchema), defaultValues: { reason: '' } });
  const cancel = useCancelOrder(order.id);
  const [unmatched, setUnmatched] = useState<string[]>([]);

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    cancel.mutate(values, {
      onSuccess: () => {
        toast.success(`The order for ${order.address} is cancelled. Everyone on it has been told.`);
        onDone();
      },
      onError: (error) => setUnmatched(applyServerFieldErrors(error, form.setError, ['reason'])),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <FormAlert error={cancel.error} extra={unmatched} />
      {order.paymentState === 'paid' ? (
        <p className="text-sm">
          The fee of <span className="numeric font-semibold">{formatMoney(order.feeTotalCents)}</span> is refunded to the card it was paid
          with.
        </p>
      ) : null}
      <TextAreaField
        label="Reason"
        hint="Everyone on the order gets an e-mail with this reason."
        error={form.formState.errors.reason?.message}
        autoFocus
        {...form.register('reason')}
      />
      <div className="flex flex-col-reverse gap-2 sm:flex-row sm:justify-end">
        <Button variant="secondary" onClick={onClose} disabled={cancel.isPending}>
          Keep the order
        </Button>
        <Button type="submit" variant="danger" pending={cancel.isPending}>
          Cancel the order
        </Button>
      </div>
    </form>
  );
}

/** Asks for a reason before cancelling; nothing happens until the person confirms. */
export function CancelOrderDialog({ order, onClose }: { order: CancelTarget | null; onClose: () => void }) {
  return (
    <Dialog open={order !== null} onClose={onClose} title="Cancel this order?" description={order?.address}>
      {order ? <CancelForm key={order.id} order={order} onDone={onClose} onClose={onClose} /> : null}
    </Dialog>
  );
}
