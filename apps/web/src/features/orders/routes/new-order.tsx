import { can, homeAreaOf } from '@underfoot/core';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { ErrorPage } from '@/components/errors/error-page';
import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { paths } from '@/config/paths';
import { errorMessage } from '@/lib/api-client';
import { actorOf, useCurrentUser } from '@/lib/auth';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useStartCheckout } from '../api';
import { OrderForm, type OrderPlaced } from '../components/order-form';
import { orderHref } from '../components/order-format';

/** What the order page shows when the checkout could not be opened straight after ordering. */
export interface CheckoutProblemState {
  checkoutError: string;
}

export function NewOrderRoute() {
  useDocumentTitle('Order an inspection');
  const user = useCurrentUser();
  const navigate = useNavigate();
  const checkout = useStartCheckout();
  const [leaving, setLeaving] = useState(false);
  if (!user) return null;
  const area = homeAreaOf[user.role];
  const home = area === 'office' ? paths.office.home.getHref() : paths.portal.home.getHref();
  if (!can(actorOf(user), 'order.create', { companyId: user.companyId })) {
    return (
      <ErrorPage
        eyebrow="Not available for your account"
        title="Inspections are ordered by agents"
        actions={<ButtonLink to={home}>Back to your reports</ButtonLink>}
      >
        <p>Your agent orders the sewer line inspection and invites you to it. Ask them if you expected one.</p>
      </ErrorPage>
    );
  }
  // An ordering agent is a party and may pay at once; the office is not on the order and cannot pay (PRODUCT.md §10).
  const canPayNow = user.role === 'agent';

  const onPlaced = ({ order, payNow }: OrderPlaced) => {
    if (payNow && order.allowed.pay) {
      setLeaving(true);
      checkout.mutate(order.id, {
        onSuccess: (url) => {
          // The provider's hosted page lives on another site: a full page load, not a route change.
          window.location.assign(url);
        },
        onError: (error) => {
          setLeaving(false);
          void navigate(orderHref(area, order.id), {
            state: { checkoutError: errorMessage(error) } satisfies CheckoutProblemState,
          });
        },
      });
      return;
    }
    void navigate(`${orderHref(area, order.id)}?placed=1`);
  };

  return (
    <div className="mx-auto max-w-3xl">
      <p className="mb-2 text-sm">
        <Link to={home}>← Back</Link>
      </p>
      <PageHeader
        title="Order an inspection"
        description="A camera inspection of the sewer line from the house to the public sewer. The office schedules the visit and e-mails everyone the arrival window."
      />
      <OrderForm canPayNow={canPayNow} onPlaced={onPlaced} busyLabel={leaving ? 'Opening the payment page…' : null} />
    </div>
  );
}
