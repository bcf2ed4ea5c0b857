import { formatMoney } from '@underfoot/core';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useStartCheckout } from '../api';

/**
 * Sends the payer to the provider's hosted checkout. If the provider does not
 * answer, nothing was charged: the message says so and the button tries again.
 */
export function PayButton({
  orderId,
  amountCents,
  initialError,
  leaveFor = (url) => window.location.assign(url),
}: {
  orderId: string;
  amountCents: number;
  /** A failure from an earlier attempt (e.g. straight after ordering). */
  initialError?: string | null;
  /** Goes to the hosted checkout; the provider's page is another site, so a full page load. */
  leaveFor?: (url: string) => void;
}) {
  const checkout = useStartCheckout();
  const pay = () =>
    checkout.mutate(orderId, {
      onSuccess: (url) => leaveFor(url),
    });
  const problem = checkout.isError ? errorMessage(checkout.error) : checkout.isIdle ? (initialError ?? null) : null;
  const providerDown = checkout.isError ? isApiError(checkout.error, 502) : Boolean(initialError);
  // After success the page is about to leave: keep the button busy until it does.
  const leaving = checkout.isPending || checkout.isSuccess;

  return (
    <div className="space-y-3">
      {problem && !leaving ? (
        <Alert tone="danger" title={providerDown ? 'The payment page could not be opened' : 'Payment could not start'}>
          <p>{problem}</p>
          <Button size="sm" variant="secondary" className="mt-2" onClick={pay}>
            Try again
          </Button>
        </Alert>
      ) : (
        <Button onClick={pay} pending={leaving} className="w-full">
          {leaving ? 'Opening the payment page…' : `Pay now · ${formatMoney(amountCents)}`}
        </Button>
      )}
      <p className="text-xs text-ink-muted">You pay on the payment provider&rsquo;s secure page and come straight back here.</p>
    </div>
  );
}
