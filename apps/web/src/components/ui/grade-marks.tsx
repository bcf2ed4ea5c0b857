import { gradeInfo, gradeStyles, type GradeLevel, type PinShape } from '@underfoot/core';
import { cn } from '@/lib/cn';

/** The shape that goes with each grade and severity, so colour is never the only cue. */
export function ShapeMark({ shape, color, className = 'size-3.5' }: { shape: PinShape; color: string; className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 16 16" className={cn('shrink-0', className)}>
      {shape === 'circle' ? <circle cx="8" cy="8" r="6.5" fill={color} /> : null}
      {shape === 'square' ? <rect x="2" y="2" width="12" height="12" rx="1" fill={color} /> : null}
      {shape === 'triangle' ? <path d="M8 1.5 15 14.5H1Z" fill={color} /> : null}
      {shape === 'diamond' ? <path d="M8 1 15 8 8 15 1 8Z" fill={color} /> : null}
      {shape === 'cross' ? <path d="M3 1 8 6 13 1 15 3 10 8 15 13 13 15 8 10 3 15 1 13 6 8 1 3Z" fill={color} /> : null}
    </svg>
  );
}

/** A grade as a small pill: shape, name, coloured edge. */
export function GradeChip({ level, className }: { level: GradeLevel; className?: string }) {
  const style = gradeStyles[level];
  return (
    <span
      className={cn(
        'inline-flex items-center gap-1.5 rounded-full border-2 bg-white px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap text-ink',
        className,
      )}
      style={{ borderColor: style.color }}
    >
      <ShapeMark shape={style.shape} color={style.color} />
      {gradeInfo[level].name}
    </span>
  );
}
