import { kindInfo, serviceKinds, structuralKinds, type DefectKind, type Inspection } from '@underfoot/core';
import { SectionCard } from './controls';

type Edit = (change: (doc: Inspection) => Inspection) => void;

/**
 * What was looked for and not seen, recorded explicitly: buyers read it as much as the
 * defects. A condition that was also recorded as a finding cannot be ticked here.
 */
export function CheckedNotFound({
  doc,
  readOnly,
  edit,
  problem,
}: {
  doc: Inspection;
  readOnly: boolean;
  edit: Edit;
  problem?: string | undefined;
}) {
  const recorded = new Set(doc.runs.flatMap((r) => r.observations.map((o) => o.kind)));
  const checked = new Set(doc.checkedNotFound);
  const toggle = (kind: DefectKind, on: boolean) =>
    edit((d) => ({
      ...d,
      checkedNotFound: on ? [...d.checkedNotFound.filter((k) => k !== kind), kind] : d.checkedNotFound.filter((k) => k !== kind),
    }));
  const groups: { title: string; kinds: readonly DefectKind[] }[] = [
    { title: 'Damage to the pipe', kinds: structuralKinds },
    { title: 'In or entering the pipe', kinds: serviceKinds },
  ];
  return (
    <SectionCard title="Checked and not found" description="Tick what you looked for along the whole line and did not see.">
      <div className="grid gap-4 sm:grid-cols-2">
        {groups.map((group) => (
          <fieldset key={group.title} disabled={readOnly} className="min-w-0">
            <legend className="mb-1 text-sm font-semibold text-ink-muted">{group.title}</legend>
            <ul className="space-y-0.5">
              {group.kinds.map((kind) => {
                const found = recorded.has(kind);
                return (
                  <li key={kind}>
                    <label className="flex min-h-10 cursor-pointer items-center gap-3 rounded-md px-1 hover:bg-sand">
                      <input
                        type="checkbox"
                        className="size-5 accent-accent"
                        checked={checked.has(kind)}
                        disabled={found && !checked.has(kind)}
                        onChange={(e) => toggle(kind, e.target.checked)}
                      />
                      <span className={found && !checked.has(kind) ? 'text-ink-muted' : undefined}>
                        {kindInfo[kind].name}
                        {found ? <span className="text-sm text-ink-muted"> · recorded as a finding</span> : null}
                      </span>
                    </label>
                  </li>
                );
              })}
            </ul>
          </fieldset>
        ))}
      </div>
      {problem ? <p className="mt-2 text-sm font-medium text-danger">{problem}</p> : null}
    </SectionCard>
  );
}
