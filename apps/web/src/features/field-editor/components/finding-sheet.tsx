import {
  bendAngles,
  bendInfo,
  branchFittings,
  featureKinds,
  formatFeetInches,
  kindInfo,
  materialNames,
  materials,
  observationSchema,
  runEndReasonNames,
  runEndReasons,
  serviceKinds,
  severityGuides,
  severityScale,
  severityStyle,
  sizeChangeFittings,
  structuralKinds,
  suggestSeverity,
  type DefectKind,
  type Material,
  type Observation,
  type ObservationKind,
  type Run,
} from '@underfoot/core';
import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { cn } from '@/lib/cn';
import { formatVideoTime, newId, parseVideoTime } from '../model/document';
import { FieldError } from '@/components/ui/field-error';
import { SelectField, TextAreaField } from '@/components/ui/form-fields';
import { TextField } from '@/components/ui/text-field';
import { ConfirmButton, Sheet } from './controls';
import { FootageField, type FootageInput } from './footage-field';
import { ShapeMark } from '@/components/ui/grade-marks';

const fittingNames: Record<string, string> = {
  wye: 'Wye (angled)',
  tee: 'Tee (square)',
  unknown: 'Not sure',
  reducer: 'Reducer',
  bushing: 'Bushing',
  increaser: 'Increaser',
  closet_bend: 'Closet bend (4 × 3)',
};

const clockNames = (hour: number) =>
  `${hour} o'clock${hour === 12 ? ' (top)' : hour === 6 ? ' (bottom)' : hour === 3 ? ' (right)' : hour === 9 ? ' (left)' : ''}`;

/** Nominal sizes met in house laterals and building drains, in inches. */
const commonSizes = [1.5, 2, 2.5, 3, 4, 5, 6, 8, 10, 12];

interface Draft {
  kind: ObservationKind | null;
  at: FootageInput;
  to: FootageInput;
  severity: number | null;
  clock: string;
  measurePercent: string;
  severityReason: string;
  note: string;
  videoTime: string;
  angle: string;
  branchFitting: string;
  fromMaterial: string;
  toMaterial: string;
  fromSize: string;
  toSize: string;
  sizeFitting: string;
  reason: string;
}

function draftFrom(
  observation: Observation | null,
  defaults: { at: number | null; videoTime: number | null; material: Material | null },
): Draft {
  const o = observation as (Observation & Record<string, unknown>) | null;
  const str = (v: unknown) => (v === null || v === undefined ? '' : String(v));
  return {
    kind: observation?.kind ?? null,
    at: { value: observation?.at ?? defaults.at, error: observation || defaults.at !== null ? null : `Enter a distance, like 24' 6".` },
    to: { value: (o?.to as number | null | undefined) ?? null, error: null },
    severity: (o?.severity as number | undefined) ?? null,
    clock: str(o?.clock),
    measurePercent: str(o?.measurePercent),
    severityReason: str(o?.severityReason),
    note: observation?.note ?? '',
    videoTime: formatVideoTime(observation ? observation.videoTime : defaults.videoTime),
    angle: str(o?.angle) || 'deg_45',
    branchFitting: (o?.kind === 'branch' ? str(o.fitting) : '') || 'wye',
    fromMaterial: str(o?.fromMaterial) || defaults.material || 'cast_iron',
    toMaterial: str(o?.toMaterial) || 'pvc',
    fromSize: str(o?.fromSize) || '4',
    toSize: str(o?.toSize) || '4',
    sizeFitting: (o?.kind === 'size_change' ? str(o.fitting) : '') || 'reducer',
    reason: str(o?.reason) || 'reached_main',
  };
}

const isDefect = (kind: ObservationKind | null): kind is DefectKind => kind !== null && kindInfo[kind].group !== 'feature';

/** The observation the draft describes (before validation). */
function observationFrom(draft: Draft, id: string, stillIds: string[]): Record<string, unknown> {
  const videoTime = parseVideoTime(draft.videoTime);
  const base = { id, kind: draft.kind, at: draft.at.value, note: draft.note, videoTime, stillIds };
  const num = (text: string) => (text.trim() === '' ? null : Number(text));
  switch (draft.kind) {
    case 'bend':
      return { ...base, angle: draft.angle };
    case 'branch':
      return { ...base, fitting: draft.branchFitting, clock: num(draft.clock) };
    case 'material_change':
      return { ...base, fromMaterial: draft.fromMaterial, toMaterial: draft.toMaterial };
    case 'size_change':
      return { ...base, fromSize: num(draft.fromSize), toSize: num(draft.toSize), fitting: draft.sizeFitting };
    case 'run_end':
      return { ...base, reason: draft.reason };
    case 'cleanout':
    case 'main_connection':
    case null:
      return base;
    default:
      return {
        ...base,
        severity: draft.severity,
        to: kindInfo[draft.kind].continuous ? draft.to.value : null,
        clock: num(draft.clock),
        measurePercent: num(draft.measurePercent),
        severityReason: draft.severityReason,
      };
  }
}

function KindPicker({
  value,
  onChange,
  error,
}: {
  value: ObservationKind | null;
  onChange: (kind: ObservationKind) => void;
  error?: string;
}) {
  const name = useId();
  const groups: { title: string; kinds: readonly ObservationKind[] }[] = [
    { title: 'Damage to the pipe', kinds: structuralKinds },
    { title: 'In or entering the pipe', kinds: serviceKinds },
    { title: 'Fittings and landmarks', kinds: featureKinds },
  ];
  return (
    <fieldset className="min-w-0">
      <legend className="mb-1.5 text-sm font-semibold">What is it?</legend>
      <div className="space-y-3">
        {groups.map((group) => (
          <div key={group.title}>
            <p className="mb-1 text-xs font-semibold tracking-wide text-ink-muted uppercase">{group.title}</p>
            <div className="flex flex-wrap gap-1.5">
              {group.kinds.map((kind) => (
                <label
                  key={kind}
                  className={cn(
                    'inline-flex min-h-10 cursor-pointer items-center rounded-full border px-3 text-sm font-medium has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent',
                    value === kind ? 'border-accent bg-accent text-white' : 'border-line-strong bg-white text-ink hover:bg-sand',
                  )}
                >
                  <input
                    type="radio"
                    name={name}
                    value={kind}
                    checked={value === kind}
                    onChange={() => onChange(kind)}
                    className="sr-only"
                  />
                  {kindInfo[kind].name}
                </label>
              ))}
            </div>
          </div>
        ))}
      </div>
      <FieldError message={error} />
    </fieldset>
  );
}

/** Severity 1–5 with the core guide's words for this kind at each level. */
function SeverityPicker({
  kind,
  value,
  onChange,
  suggested,
  error,
}: {
  kind: DefectKind;
  value: number | null;
  onChange: (severity: number) => void;
  suggested: number | null;
  error?: string | undefined;
}) {
  const name = useId();
  const guide = severityGuides[kind];
  return (
    <fieldset className="min-w-0">
      <legend className="text-sm font-semibold">Severity</legend>
      <p className="mb-1.5 text-sm text-ink-muted">The guide for {kindInfo[kind].name.toLowerCase()}:</p>
      <div className="space-y-1.5">
        {severityScale.map(({ severity, name: scaleName }) => {
          const style = severityStyle(severity);
          return (
            <label
              key={severity}
              className={cn(
                'flex cursor-pointer gap-3 rounded-lg border px-3 py-2 has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent',
                value === severity ? 'border-accent bg-accent-soft ring-1 ring-accent' : 'border-line bg-white hover:bg-sand',
              )}
            >
              <input
                type="radio"
                name={name}
                value={severity}
                checked={value === severity}
                onChange={() => onChange(severity)}
                className="mt-1 size-4 shrink-0 accent-accent"
              />
              <span className="min-w-0">
                <span className="flex items-center gap-1.5 font-semibold">
                  <ShapeMark shape={style.shape} color={style.color} className="size-3" />
                  {severity} · {scaleName}
                  {suggested === severity ? <span className="text-xs font-semibold text-accent">(guide’s suggestion)</span> : null}
                </span>
                <span className="block text-sm text-ink-muted">{guide.levels[severity - 1]}</span>
              </span>
            </label>
          );
        })}
      </div>
      <FieldError message={error} />
    </fieldset>
  );
}

export interface FindingSheetProps {
  open: boolean;
  onClose: () => void;
  run: Run;
  /** Null to add a new finding. */
  observation: Observation | null;
  /** For a new finding from the paused video: where the player stands. */
  videoTimeHint: number | null;
  readOnly: boolean;
  onSave: (observation: Observation, extendRunTo: number | null) => void;
  onDelete: (observationId: string) => void;
  stills?: ReactNode;
}

/**
 * Add or edit one finding: where (footage typed the trade's way), what (the kind, in
 * three groups), how bad (severity with the guide's words), and the details of
 * fittings. A finding past where the run ends moves the end out to it, and says so.
 */
export function FindingSheet(props: FindingSheetProps) {
  const { open, onClose, observation } = props;
  return (
    <Sheet open={open} onClose={onClose} title={observation ? `Edit: ${kindInfo[observation.kind].name}` : 'Add a finding'}>
      {open ? <FindingForm key={observation?.id ?? 'new'} {...props} /> : null}
    </Sheet>
  );
}

function FindingForm({ run, observation, videoTimeHint, readOnly, onSave, onDelete, onClose, stills }: FindingSheetProps) {
  const sectionAt = (at: number | null) => (at === null ? null : (run.sections.find((s) => s.from <= at && at < s.to) ?? null));
  const [draft, setDraft] = useState<Draft>(() =>
    draftFrom(observation, {
      at: null,
      videoTime: videoTimeHint,
      material: sectionAt(null)?.material ?? run.sections[0]?.material ?? null,
    }),
  );
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [submitted, setSubmitted] = useState(false);
  const set = (patch: Partial<Draft>) => setDraft((d) => ({ ...d, ...patch }));

  const defect = isDefect(draft.kind) ? draft.kind : null;
  const measure = defect ? severityGuides[defect].measure : undefined;
  const measured = draft.measurePercent.trim() === '' ? null : Number(draft.measurePercent);
  const suggested = defect && measured !== null && Number.isFinite(measured) ? suggestSeverity(defect, measured) : null;
  const needsReason = suggested !== null && draft.severity !== null && suggested !== draft.severity;
  const end = draft.kind && defect && kindInfo[draft.kind].continuous && draft.to.value !== null ? draft.to.value : draft.at.value;
  const extendTo = end !== null && end > run.distanceReached ? end : null;

  function submit(event: FormEvent) {
    event.preventDefault();
    setSubmitted(true);
    const found: Record<string, string> = {};
    if (draft.at.error) found.at = draft.at.error;
    if (draft.to.error) found.to = draft.to.error;
    if (!draft.kind) found.kind = 'Choose what was observed.';
    if (Number.isNaN(parseVideoTime(draft.videoTime))) found.videoTime = 'Write the video time like 1:23 or 83.';
    if (defect && draft.severity === null) found.severity = 'Choose a severity from 1 to 5.';
    if (Object.keys(found).length === 0) {
      const candidate = observationFrom(draft, observation?.id ?? newId(), observation?.stillIds ?? []);
      const parsed = observationSchema.safeParse(candidate);
      if (parsed.success) {
        onSave(parsed.data, extendTo);
        onClose();
        return;
      }
      for (const issue of parsed.error.issues) {
        const key = String(issue.path[0] ?? 'kind');
        found[key] ??= issue.message;
      }
    }
    setErrors(found);
  }

  const error = (key: string) => (submitted ? errors[key] : undefined);

  return (
    <form onSubmit={submit} noValidate className="space-y-5">
      <fieldset disabled={readOnly} className="min-w-0 space-y-5">
        <FootageField
          label="Where, from the access point"
          value={draft.at.value}
          onChange={(at) => set({ at })}
          error={error('at')}
          hint={`Type it the way you say it: 24' 6", 24 ft 6 in or 24.5 ft.`}
          autoFocus={!observation}
        />
        {extendTo !== null ? (
          <p className="rounded-lg border border-accent/30 bg-accent-soft px-3 py-2 text-sm text-accent-strong">
            This is past where the run ends now ({formatFeetInches(run.distanceReached)}); saving moves the end of the run out to{' '}
            <span className="numeric font-semibold">{formatFeetInches(extendTo)}</span>.
          </p>
        ) : null}

        <KindPicker value={draft.kind} onChange={(kind) => set({ kind })} error={error('kind')} />

        {defect ? (
          <>
            {measure ? (
              <TextField
                label={`Measured ${measure.label}`}
                hint="Optional. The guide suggests a severity from it."
                inputMode="decimal"
                value={draft.measurePercent}
                onChange={(e) => set({ measurePercent: e.target.value })}
                error={error('measurePercent')}
              />
            ) : null}
            <SeverityPicker
              kind={defect}
              value={draft.severity}
              onChange={(severity) => set({ severity })}
              suggested={suggested}
              error={error('severity')}
            />
            {needsReason ? (
              <TextAreaField
                rows={2}
                label={`Why ${draft.severity} rather than the guide’s ${suggested}?`}
                value={draft.severityReason}
                onChange={(e) => set({ severityReason: e.target.value })}
                error={error('severityReason')}
              />
            ) : null}
            {kindInfo[defect].continuous ? (
              <FootageField
                label="Runs on to"
                optional
                value={draft.to.value}
                onChange={(to) => set({ to })}
                error={error('to')}
                hint="For a defect that continues along the pipe."
              />
            ) : null}
            <SelectField label="Clock position" value={draft.clock} onChange={(e) => set({ clock: e.target.value })} error={error('clock')}>
              <option value="">Not noted</option>
              {[12, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11].map((h) => (
                <option key={h} value={h}>
                  {clockNames(h)}
                </option>
              ))}
            </SelectField>
          </>
        ) : null}

        {draft.kind === 'bend' ? (
          <SelectField label="Bend angle" value={draft.angle} onChange={(e) => set({ angle: e.target.value })} error={error('angle')}>
            {bendAngles.map((a) => (
              <option key={a} value={a}>
                {bendInfo[a].name} ({bendInfo[a].fitting})
              </option>
            ))}
          </SelectField>
        ) : null}

        {draft.kind === 'branch' ? (
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField label="Fitting" value={draft.branchFitting} onChange={(e) => set({ branchFitting: e.target.value })}>
              {branchFittings.map((f) => (
                <option key={f} value={f}>
                  {fittingNames[f]}
                </option>
              ))}
            </SelectField>
            <SelectField label="Comes in at" value={draft.clock} onChange={(e) => set({ clock: e.target.value })}>
              <option value="">Not noted</option>
              {[12, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11].map((h) => (
                <option key={h} value={h}>
                  {clockNames(h)}
                </option>
              ))}
            </SelectField>
          </div>
        ) : null}

        {draft.kind === 'material_change' ? (
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField
              label="From (access point side)"
              value={draft.fromMaterial}
              onChange={(e) => set({ fromMaterial: e.target.value })}
            >
              {materials.map((m) => (
                <option key={m} value={m}>
                  {materialNames[m]}
                </option>
              ))}
            </SelectField>
            <SelectField label="To (further along)" value={draft.toMaterial} onChange={(e) => set({ toMaterial: e.target.value })}>
              {materials.map((m) => (
                <option key={m} value={m}>
                  {materialNames[m]}
                </option>
              ))}
            </SelectField>
          </div>
        ) : null}

        {draft.kind === 'size_change' ? (
          <div className="grid gap-4 sm:grid-cols-3">
            <SelectField
              label="From (in)"
              value={draft.fromSize}
              onChange={(e) => set({ fromSize: e.target.value })}
              error={error('fromSize')}
            >
              {commonSizes.map((s) => (
                <option key={s} value={s}>
                  {s}″
                </option>
              ))}
            </SelectField>
            <SelectField label="To (in)" value={draft.toSize} onChange={(e) => set({ toSize: e.target.value })} error={error('toSize')}>
              {commonSizes.map((s) => (
                <option key={s} value={s}>
                  {s}″
                </option>
              ))}
            </SelectField>
            <SelectField label="Fitting" value={draft.sizeFitting} onChange={(e) => set({ sizeFitting: e.target.value })}>
              {sizeChangeFittings.map((f) => (
                <option key={f} value={f}>
                  {fittingNames[f]}
                </option>
              ))}
            </SelectField>
          </div>
        ) : null}

        {draft.kind === 'run_end' ? (
          <SelectField label="Why the run ended" value={draft.reason} onChange={(e) => set({ reason: e.target.value })}>
            {runEndReasons.map((r) => (
              <option key={r} value={r}>
                {runEndReasonNames[r]}
              </option>
            ))}
          </SelectField>
        ) : null}

        {draft.kind ? <p className="text-sm text-ink-muted">{kindInfo[draft.kind].explanation}</p> : null}

        <TextAreaField rows={2} label="Note" value={draft.note} onChange={(e) => set({ note: e.target.value })} error={error('note')} />
        <TextField
          label="Video time"
          hint="Where it shows in the run’s video, like 1:23."
          inputMode="decimal"
          className="max-w-48"
          value={draft.videoTime}
          onChange={(e) => set({ videoTime: e.target.value })}
          error={error('videoTime')}
        />
      </fieldset>

      {stills}

      {submitted && Object.keys(errors).length > 0 ? (
        <p role="alert" className="text-sm font-semibold text-danger">
          Check the marked fields.
        </p>
      ) : null}

      <div className="flex flex-wrap items-center gap-2 border-t border-line pt-4">
        {!readOnly ? <Button type="submit">{observation ? 'Save finding' : 'Add finding'}</Button> : null}
        <Button variant="secondary" onClick={onClose}>
          {readOnly ? 'Close' : 'Cancel'}
        </Button>
        {observation && !readOnly ? (
          <ConfirmButton
            className="ml-auto"
            label="Delete finding"
            confirmLabel="Tap again to delete"
            onConfirm={() => {
              onDelete(observation.id);
              onClose();
            }}
          />
        ) : null}
      </div>
    </form>
  );
}
