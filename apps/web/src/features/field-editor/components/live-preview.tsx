import { formatRange, type Analysis, type Check } from '@underfoot/core';
import { cn } from '@/lib/cn';
import { GradeChip } from '@/components/ui/grade-marks';
import { SectionCard } from './controls';

const checkLevelNames: Record<Check['level'], string> = { concern: 'Concern', advice: 'Advice', note: 'Note' };
const checkLevelClasses: Record<Check['level'], string> = {
  concern: 'border-danger/40 bg-danger-soft',
  advice: 'border-caution/40 bg-caution-soft',
  note: 'border-line bg-sand/60',
};

/**
 * What the findings so far add up to, computed in the browser by the same core the
 * report uses: the grade and why, the cost options, the checks and the buyer's summary.
 */
export function LivePreview({
  analysis,
  stale,
  demoPrices,
}: {
  analysis: Analysis | null;
  /** The document has a field problem: this is the preview from before it. */
  stale: boolean;
  demoPrices: boolean;
}) {
  if (!analysis) {
    return (
      <SectionCard id="preview" title="What this adds up to">
        <p className="text-ink-muted">The grade, cost range and checks appear here as soon as the line has a run.</p>
      </SectionCard>
    );
  }
  const { grade, costs, checks, summary } = analysis;
  const proposed = costs.options.find((o) => o.kind === costs.proposed);
  return (
    <SectionCard
      id="preview"
      title="What this adds up to"
      description="Worked out from the findings as you record them. The office reviews everything before the report is published."
    >
      {stale ? (
        <p className="mb-3 rounded-lg border border-caution/40 bg-caution-soft px-3 py-2 text-sm text-caution">
          Paused while a field needs fixing; this is the preview from before.
        </p>
      ) : null}
      <div className="space-y-5" aria-live="polite">
        <div>
          <div className="flex flex-wrap items-center gap-2">
            <span className="text-sm text-ink-muted">Condition grade</span>
            <GradeChip level={grade.level} />
          </div>
          <p className="mt-1.5 text-sm">
            {grade.meaning} <span className="font-semibold">{grade.action}</span>
          </p>
          {grade.drivers.length > 0 ? (
            <ul className="mt-2 list-disc space-y-0.5 pl-5 text-sm text-ink-muted">
              {grade.drivers.slice(0, 4).map((d, i) => (
                <li key={`${d.ruleId}-${i}`}>{d.text}</li>
              ))}
            </ul>
          ) : null}
        </div>

        <div>
          <h3 className="text-sm font-semibold">Repair cost range</h3>
          {proposed ? (
            <p className="mt-1">
              <span className="numeric text-lg font-semibold">{formatRange(proposed)}</span>{' '}
              <span className="text-sm text-ink-muted">· {proposed.name}</span>
            </p>
          ) : (
            <p className="mt-1 text-sm text-ink-muted">No repair or cleaning proposed from the findings so far.</p>
          )}
          {costs.options.length > (proposed ? 1 : 0) ? (
            <details className="mt-1.5 text-sm">
              <summary className="min-h-9 cursor-pointer py-1 font-semibold text-accent">Other options</summary>
              <ul className="mt-1 space-y-1">
                {costs.options
                  .filter((o) => o.kind !== costs.proposed)
                  .map((o) => (
                    <li key={o.kind} className="flex flex-wrap justify-between gap-x-3">
                      <span>{o.name}</span>
                      <span className="numeric font-semibold">{formatRange(o)}</span>
                    </li>
                  ))}
              </ul>
            </details>
          ) : null}
          <p className="mt-1.5 text-xs text-ink-muted">
            {demoPrices ? 'Prices from the demo price book until the office sets its own. ' : ''}
            {costs.disclaimer}
          </p>
        </div>

        <div>
          <h3 className="text-sm font-semibold">Checks</h3>
          {checks.length === 0 ? (
            <p className="mt-1 text-sm text-ink-muted">Nothing to flag from the findings so far.</p>
          ) : (
            <ul className="mt-1.5 space-y-1.5">
              {checks.map((check) => (
                <li key={check.id} className={cn('rounded-lg border px-3 py-2 text-sm', checkLevelClasses[check.level])}>
                  <p className="font-semibold">
                    <span className="sr-only">{checkLevelNames[check.level]}: </span>
                    {check.title}
                  </p>
                  <p className="text-ink-muted">{check.text}</p>
                </li>
              ))}
            </ul>
          )}
        </div>

        <div>
          <h3 className="text-sm font-semibold">What the buyer will read</h3>
          <p className="mt-1 text-sm leading-6">{summary.text}</p>
        </div>
      </div>
    </SectionCard>
  );
}
