import { Button } from '@/components/ui/button';
import type { InspectionView } from '../api';
import { Sheet } from './controls';

const when = new Intl.DateTimeFormat(undefined, { hour: 'numeric', minute: '2-digit', day: 'numeric', month: 'short' });

/**
 * A save met a newer version (another phone, another tab, the office). Nothing is
 * overwritten: the person merges this phone's changes into it, or takes it as it is.
 */
export function ConflictDialog({
  conflict,
  restoredDraft,
  onMerge,
  onTakeTheirs,
}: {
  conflict: InspectionView | null;
  restoredDraft: boolean;
  onMerge: () => void;
  onTakeTheirs: () => void;
}) {
  const who = conflict?.updatedBy?.name ?? 'Someone';
  const at = conflict?.updatedAt ? when.format(new Date(conflict.updatedAt)) : null;
  return (
    <Sheet
      open={conflict !== null}
      // The question has to be answered: closing would leave the changes unsaved with no way forward.
      onClose={() => undefined}
      dismissible={false}
      title="This inspection changed elsewhere"
      description={
        restoredDraft
          ? `This phone kept changes that were not saved before, and ${who} has saved a newer version${at ? ` (${at})` : ''} since.`
          : `${who} saved a newer version${at ? ` at ${at}` : ''} while you were editing. Your changes are not saved yet.`
      }
    >
      <div className="space-y-4 text-sm">
        <div className="rounded-lg border border-line bg-white p-3">
          <p className="font-semibold">Merge my changes into theirs</p>
          <p className="text-ink-muted">
            Their version, plus everything you added or changed here. Where you both changed the same detail, yours is kept; check it
            afterwards.
          </p>
        </div>
        <div className="rounded-lg border border-line bg-white p-3">
          <p className="font-semibold">Reload their version</p>
          <p className="text-ink-muted">Your unsaved changes on this device are dropped.</p>
        </div>
        <div className="flex flex-wrap gap-2 border-t border-line pt-4">
          <Button onClick={onMerge}>Merge my changes</Button>
          <Button variant="secondary" onClick={onTakeTheirs}>
            Reload their version
          </Button>
        </div>
      </div>
    </Sheet>
  );
}
