import { formatFeetInches, type Run } from '@underfoot/core';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field-error';
import { FootageField, type FootageInput } from './footage-field';

/**
 * Optional depth readings from a locator: depth below grade at a footage mark. They drive
 * the slope check and the digging prices; a reading is approximate (a tenth of the depth
 * is a fair allowance: common practice, no source).
 */
export function DepthReadings({
  run,
  runIndex,
  problems,
  readOnly,
  editRun,
}: {
  run: Run;
  runIndex: number;
  problems: Map<string, string>;
  readOnly: boolean;
  editRun: (change: (run: Run) => Run) => void;
}) {
  const [at, setAt] = useState<FootageInput>({ value: null, error: null });
  const [depth, setDepth] = useState<FootageInput>({ value: null, error: null });
  const [formKey, setFormKey] = useState(0);
  const [error, setError] = useState<string | null>(null);

  function add() {
    if (at.error || depth.error || at.value === null || depth.value === null) {
      setError(at.error ?? depth.error ?? 'Enter the footage and the depth.');
      return;
    }
    if (run.depthReadings.some((r) => r.at === at.value)) {
      setError(`There is already a reading at ${formatFeetInches(at.value)}.`);
      return;
    }
    const reading = { at: at.value, depth: depth.value, surfaceElevation: null };
    editRun((r) => ({ ...r, depthReadings: [...r.depthReadings, reading].sort((a, b) => a.at - b.at) }));
    setAt({ value: null, error: null });
    setDepth({ value: null, error: null });
    setFormKey((k) => k + 1);
    setError(null);
  }

  return (
    <div className="space-y-3">
      {run.depthReadings.length === 0 ? (
        <p className="text-sm text-ink-muted">
          Optional: depth from the ground surface down to the pipe, from a locator. With two or more readings the slope of the line is
          checked against the plumbing code minimum.
        </p>
      ) : (
        <ul className="divide-y divide-line rounded-lg border border-line bg-white">
          {run.depthReadings.map((reading, index) => {
            const problem = [...problems.entries()].find(([path]) => path.startsWith(`runs.${runIndex}.depthReadings.${index}.`))?.[1];
            return (
              <li key={reading.at} className="flex flex-wrap items-center gap-x-3 px-3 py-2">
                <span className="numeric flex-1">
                  At <span className="font-semibold">{formatFeetInches(reading.at)}</span>:{' '}
                  <span className="font-semibold">{formatFeetInches(reading.depth)}</span> deep
                </span>
                {!readOnly ? (
                  <Button
                    size="sm"
                    variant="quiet"
                    className="text-danger hover:bg-danger-soft"
                    onClick={() => editRun((r) => ({ ...r, depthReadings: r.depthReadings.filter((d) => d.at !== reading.at) }))}
                  >
                    Remove<span className="sr-only"> the reading at {formatFeetInches(reading.at)}</span>
                  </Button>
                ) : null}
                {problem ? <FieldError message={problem} /> : null}
              </li>
            );
          })}
        </ul>
      )}
      {!readOnly ? (
        <div key={formKey} className="rounded-lg border border-dashed border-line-strong p-3">
          <div className="grid grid-cols-2 gap-3">
            <FootageField label="At" value={at.value} onChange={setAt} />
            <FootageField label="Depth" value={depth.value} onChange={setDepth} />
          </div>
          {error ? (
            <div className="mt-2">
              <FieldError message={error} />
            </div>
          ) : null}
          <Button size="sm" className="mt-3" onClick={add}>
            Add reading
          </Button>
        </div>
      ) : null}
    </div>
  );
}
