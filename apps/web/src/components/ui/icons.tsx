/** Line icons of our own, drawn on a 24-unit grid. */
const base = {
  'aria-hidden': true,
  viewBox: '0 0 24 24',
  fill: 'none',
  stroke: 'currentColor',
  strokeWidth: 1.75,
  strokeLinecap: 'round',
  strokeLinejoin: 'round',
} as const;

export function ClipboardIcon({ className = 'size-10' }: { className?: string }) {
  return (
    <svg {...base} className={className}>
      <path d="M9 4h6v3H9zM7 5.5H5.5v15h13v-15H17" />
      <path d="M8.5 11h7M8.5 14.5h7M8.5 18h4" />
    </svg>
  );
}

export function CameraPipeIcon({ className = 'size-10' }: { className?: string }) {
  return (
    <svg {...base} className={className}>
      <path d="M2.5 6h19" strokeDasharray="2 2.5" />
      <rect x="3" y="11" width="12" height="7" rx="3.5" />
      <path d="M15 14.5h3.5l2.5-2v4l-2.5-2" />
    </svg>
  );
}

export function DocumentIcon({ className = 'size-10' }: { className?: string }) {
  return (
    <svg {...base} className={className}>
      <path d="M6 3h8l4 4v14H6z" />
      <path d="M14 3v4h4M9 12h6M9 15.5h6M9 19h3" />
    </svg>
  );
}

export function EnvelopeIcon({ className = 'size-10' }: { className?: string }) {
  return (
    <svg {...base} className={className}>
      <rect x="3" y="5" width="18" height="14" rx="2" />
      <path d="m4 7 8 6 8-6" />
    </svg>
  );
}
