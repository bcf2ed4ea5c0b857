import { Alert } from '@/components/ui/alert';
import { ButtonLink } from '@/components/ui/button';
import { paths, type Area } from '@/config/paths';
import type { OrderDetail } from '../api';

const reportHref = (area: Area, orderId: string) =>
  area === 'office'
    ? paths.reports.office.getHref(orderId)
    : area === 'field'
      ? paths.reports.field.getHref(orderId)
      : paths.reports.portal.getHref(orderId);

/** The way from an order to its report: the reader's copy once published, the review screen for the company. */
export function ReportLink({ order, area }: { order: OrderDetail; area: Area }) {
  const staff = area !== 'portal';
  if (order.report) {
    return (
      <Alert tone={order.report.releaseHeld ? 'caution' : 'success'} title={`Report published: ${order.report.grade}`}>
        <p>
          {order.report.releaseHeld
            ? 'It is held until the inspection fee is paid.'
            : order.report.revision > 1
              ? `Revision ${order.report.revision} is the latest.`
              : 'Read it on this device or download the PDF.'}
        </p>
        <ButtonLink to={reportHref(area, order.id)} size="sm" className="mt-2">
          {staff ? 'Open the report and its review' : 'Read the report'}
        </ButtonLink>
      </Alert>
    );
  }
  if (staff && (order.status === 'scheduled' || order.status === 'recorded' || order.status === 'in_review')) {
    return (
      <Alert tone="info" title="Not published yet">
        <p>Review the grade, costs and summary the inspection adds up to, then publish.</p>
        <ButtonLink to={reportHref(area, order.id)} size="sm" variant="secondary" className="mt-2">
          Review and publish
        </ButtonLink>
      </Alert>
    );
  }
  return null;
}
