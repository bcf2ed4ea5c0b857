import { accessPointKinds, accessPointNames, type AccessPointKind, type Inspection } from '@underfoot/core';
import { Button } from '@/components/ui/button';
import { addAccessPoint, addRun, removeAccessPoint, updateAccessPoint } from '../model/document';
import { SelectField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { SectionCard } from './controls';

type Edit = (change: (doc: Inspection) => Inspection) => void;

/** Where the camera went in: cleanouts, a pulled toilet, a roof vent. Each can start runs both ways. */
export function AccessPoints({
  doc,
  readOnly,
  edit,
  accessNotes,
  problems,
}: {
  doc: Inspection;
  readOnly: boolean;
  edit: Edit;
  accessNotes: string;
  problems: Map<string, string>;
}) {
  return (
    <SectionCard
      title="Access points"
      description={accessNotes ? `From the order: ${accessNotes}` : 'Where the camera goes in.'}
      actions={
        !readOnly ? (
          <Button size="sm" variant="secondary" onClick={() => edit((d) => addAccessPoint(d)[0])}>
            Add access point
          </Button>
        ) : null
      }
    >
      {doc.accessPoints.length === 0 ? (
        <div className="space-y-3">
          <p className="text-sm text-ink-muted">
            No access point yet. Start with the cleanout (or the pulled toilet or roof vent) you went in through.
          </p>
          {!readOnly ? (
            <Button
              onClick={() =>
                edit((d) => {
                  const [withAccess, accessId] = addAccessPoint(d);
                  return addRun(withAccess, accessId)[0];
                })
              }
            >
              Start with a two-way cleanout and a run toward the main
            </Button>
          ) : null}
        </div>
      ) : (
        <ol className="space-y-3">
          {doc.accessPoints.map((access, index) => {
            const used = doc.runs.filter((r) => r.accessPointId === access.id).length;
            return (
              <li key={access.id} className="rounded-lg border border-line bg-white p-3">
                <p className="mb-2 text-sm font-semibold text-ink-muted">Access point {index + 1}</p>
                <div className="grid gap-3 sm:grid-cols-2">
                  <SelectField
                    label="Kind"
                    value={access.kind}
                    disabled={readOnly}
                    onChange={(e) => edit((d) => updateAccessPoint(d, access.id, { kind: e.target.value as AccessPointKind }))}
                    error={problems.get(`accessPoints.${index}.kind`)}
                  >
                    {accessPointKinds.map((kind) => (
                      <option key={kind} value={kind}>
                        {accessPointNames[kind]}
                      </option>
                    ))}
                  </SelectField>
                  <TextField
                    label="Where it is"
                    placeholder="e.g. Left of the garage door"
                    maxLength={200}
                    value={access.locationNote}
                    disabled={readOnly}
                    onChange={(e) => edit((d) => updateAccessPoint(d, access.id, { locationNote: e.target.value }))}
                    error={problems.get(`accessPoints.${index}.locationNote`)}
                  />
                </div>
                {!readOnly ? (
                  <div className="mt-2 flex flex-wrap gap-2">
                    <Button size="sm" variant="quiet" onClick={() => edit((d) => addRun(d, access.id)[0])}>
                      Add a run from here
                    </Button>
                    {used === 0 ? (
                      <Button
                        size="sm"
                        variant="quiet"
                        className="text-danger hover:bg-danger-soft"
                        onClick={() => edit((d) => removeAccessPoint(d, access.id))}
                      >
                        Remove
                      </Button>
                    ) : (
                      <span className="self-center text-sm text-ink-muted">
                        {used} {used === 1 ? 'run starts' : 'runs start'} here
                      </span>
                    )}
                  </div>
                ) : null}
              </li>
            );
          })}
        </ol>
      )}
    </SectionCard>
  );
}
