import { Alert } from '@/components/ui/alert';
import { Button, ButtonLink } from '@/components/ui/button';
import { paths, type Area } from '@/config/paths';
import { useFinishRecording, type OrderDetail } from '../api';

/** For the inspector and the office: the way into the recording screen, and the step that says the visit is done. */
export function InspectionLink({ order, area }: { order: OrderDetail; area: Area }) {
  const finish = useFinishRecording(order.id);
  if (area === 'portal' || !order.allowed.recordInspection) return null;
  const href = area === 'office' ? paths.inspection.office.getHref(order.id) : paths.inspection.field.getHref(order.id);
  return (
    <Alert tone="info" title={order.status === 'scheduled' ? 'Record the line' : 'The recording'}>
      <p>
        {order.status === 'scheduled'
          ? 'Add the access points, runs, findings, video and stills. Everything saves as you go.'
          : 'The visit is recorded. Changes are still possible until the report is published.'}
      </p>
      <div className="mt-2 flex flex-wrap gap-2">
        <ButtonLink to={href} size="sm">
          {order.status === 'scheduled' ? 'Record the line' : 'Open the recording'}
        </ButtonLink>
        {order.allowed.finishRecording ? (
          <Button type="button" size="sm" variant="secondary" pending={finish.isPending} onClick={() => finish.mutate(undefined)}>
            Finish recording
          </Button>
        ) : null}
      </div>
    </Alert>
  );
}
