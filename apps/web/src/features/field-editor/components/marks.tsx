import { severityScale, severityStyle } from '@underfoot/core';
import { ShapeMark } from '@/components/ui/grade-marks';

export function SeverityChip({ severity }: { severity: number }) {
  const style = severityStyle(severity);
  const scale = severityScale.find((s) => s.severity === severity);
  return (
    <span className="inline-flex items-center gap-1 text-sm font-semibold whitespace-nowrap text-ink">
      <ShapeMark shape={style.shape} color={style.color} className="size-3" />
      <span className="numeric">{severity}</span>
      <span className="sr-only"> of 5, {scale?.name}</span>
    </span>
  );
}
