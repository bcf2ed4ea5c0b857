import type { ComponentProps } from 'react';
import { cn } from '@/lib/cn';

/** A sheet of paper on the desk: the basic container of every page. */
export function Card({ className, ...props }: ComponentProps<'div'>) {
  return <div className={cn('rounded-card border border-line bg-sheet shadow-sheet', className)} {...props} />;
}

export function CardBody({ className, ...props }: ComponentProps<'div'>) {
  return <div className={cn('p-5 sm:p-6', className)} {...props} />;
}
