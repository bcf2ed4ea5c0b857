import { formatFeetInches, materialNames, materials, type Material, type PipeSection, type Run } from '@underfoot/core';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { newId } from '../model/document';
import { FieldError } from '@/components/ui/field-error';
import { SelectField } from '@/components/ui/form-fields';
import { FootageField, type FootageInput } from './footage-field';

/** Nominal sizes met in house laterals, in inches (a house lateral is most often 4 in: common practice, no source). */
const sizes = [2, 3, 4, 5, 6, 8, 10, 12];

/**
 * The pipe along a run, section by section: from–to footage, material, size. A new section
 * starts where the last one ended; one past the end of the run moves the end out to it.
 */
export function PipeSections({
  run,
  runIndex,
  problems,
  readOnly,
  onSave,
  onRemove,
}: {
  run: Run;
  runIndex: number;
  problems: Map<string, string>;
  readOnly: boolean;
  onSave: (section: PipeSection, extendRunTo: number | null) => void;
  onRemove: (sectionId: string) => void;
}) {
  const lastEnd = run.sections.reduce((max, s) => Math.max(max, s.to), 0);
  const blank = () => ({
    id: null as string | null,
    from: { value: lastEnd, error: null } as FootageInput,
    to: { value: run.distanceReached > lastEnd ? run.distanceReached : null, error: null } as FootageInput,
    material: (run.sections.at(-1)?.material ?? 'cast_iron') as Material,
    diameterIn: run.sections.at(-1)?.diameterIn ?? 4,
  });
  const [form, setForm] = useState(blank);
  const [formKey, setFormKey] = useState(0);
  const [error, setError] = useState<string | null>(null);

  function reset() {
    setForm(blank());
    setFormKey((k) => k + 1);
    setError(null);
  }

  function submit() {
    const { from, to } = form;
    if (from.error || to.error || from.value === null || to.value === null) {
      setError(from.error ?? to.error ?? 'Enter where the section starts and ends.');
      return;
    }
    if (to.value <= from.value) {
      setError('A section must end further along than it starts.');
      return;
    }
    const overlap = run.sections.find((s) => s.id !== form.id && from.value! < s.to && s.from < to.value!);
    if (overlap) {
      setError(`This overlaps the section from ${formatFeetInches(overlap.from)} to ${formatFeetInches(overlap.to)}.`);
      return;
    }
    const extendTo = to.value > run.distanceReached ? to.value : null;
    onSave({ id: form.id ?? newId(), from: from.value, to: to.value, material: form.material, diameterIn: form.diameterIn }, extendTo);
    // The next section starts where this one ends (the run prop still shows the old list here).
    const end = Math.max(lastEnd, to.value);
    const reached = Math.max(run.distanceReached, extendTo ?? 0);
    setForm({
      id: null,
      from: { value: end, error: null },
      to: { value: reached > end ? reached : null, error: null },
      material: form.material,
      diameterIn: form.diameterIn,
    });
    setFormKey((k) => k + 1);
    setError(null);
  }

  return (
    <div className="space-y-3">
      {run.sections.length === 0 ? (
        <p className="text-sm text-ink-muted">No pipe sections yet. Add the first from the access point (0′ 0″).</p>
      ) : (
        <ul className="divide-y divide-line rounded-lg border border-line bg-white">
          {run.sections.map((section, index) => {
            const problem = [...problems.entries()].find(([path]) => path.startsWith(`runs.${runIndex}.sections.${index}.`))?.[1];
            return (
              <li key={section.id} className="flex flex-wrap items-center gap-x-3 gap-y-0.5 px-3 py-2">
                <span className="numeric basis-full font-semibold whitespace-nowrap sm:basis-auto">
                  {formatFeetInches(section.from)} – {formatFeetInches(section.to)}
                </span>
                <span className="min-w-0 flex-1 text-sm">
                  {materialNames[section.material]}, {section.diameterIn}″
                </span>
                {!readOnly ? (
                  <span className="flex gap-1">
                    <Button
                      size="sm"
                      variant="quiet"
                      onClick={() => {
                        setForm({
                          id: section.id,
                          from: { value: section.from, error: null },
                          to: { value: section.to, error: null },
                          material: section.material,
                          diameterIn: section.diameterIn,
                        });
                        setFormKey((k) => k + 1);
                      }}
                    >
                      Edit<span className="sr-only"> section from {formatFeetInches(section.from)}</span>
                    </Button>
                    <Button size="sm" variant="quiet" className="text-danger hover:bg-danger-soft" onClick={() => onRemove(section.id)}>
                      Remove<span className="sr-only"> section from {formatFeetInches(section.from)}</span>
                    </Button>
                  </span>
                ) : null}
                {problem ? <FieldError message={problem} /> : null}
              </li>
            );
          })}
        </ul>
      )}
      {!readOnly ? (
        <div key={formKey} className="rounded-lg border border-dashed border-line-strong p-3">
          <p className="mb-2 text-sm font-semibold">{form.id ? 'Change this section' : 'Add a section'}</p>
          <div className="grid grid-cols-2 gap-3">
            <FootageField label="From" value={form.from.value} onChange={(from) => setForm((f) => ({ ...f, from }))} />
            <FootageField label="To" value={form.to.value} onChange={(to) => setForm((f) => ({ ...f, to }))} />
            <SelectField
              label="Material"
              value={form.material}
              onChange={(e) => setForm((f) => ({ ...f, material: e.target.value as Material }))}
            >
              {materials.map((m) => (
                <option key={m} value={m}>
                  {materialNames[m]}
                </option>
              ))}
            </SelectField>
            <SelectField
              label="Size"
              value={form.diameterIn}
              onChange={(e) => setForm((f) => ({ ...f, diameterIn: Number(e.target.value) }))}
            >
              {sizes.map((s) => (
                <option key={s} value={s}>
                  {s} in
                </option>
              ))}
            </SelectField>
          </div>
          {error ? (
            <div className="mt-2">
              <FieldError message={error} />
            </div>
          ) : null}
          <div className="mt-3 flex gap-2">
            <Button size="sm" onClick={submit}>
              {form.id ? 'Save section' : 'Add section'}
            </Button>
            {form.id ? (
              <Button size="sm" variant="secondary" onClick={reset}>
                Cancel
              </Button>
            ) : null}
          </div>
        </div>
      ) : null}
    </div>
  );
}
