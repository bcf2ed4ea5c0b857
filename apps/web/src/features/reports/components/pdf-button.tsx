import { buttonClasses } from '@/components/ui/button';

/** A plain download link: the browser saves the PDF the server sends as an attachment. */
export function PdfButton({ href }: { href: string }) {
  return (
    <a href={href} download className={buttonClasses('secondary', 'md')}>
      <svg
        aria-hidden="true"
        viewBox="0 0 24 24"
        className="size-5"
        fill="none"
        stroke="currentColor"
        strokeWidth="2"
        strokeLinecap="round"
      >
        <path d="M12 4v11m0 0-4-4m4 4 4-4M5 19h14" />
      </svg>
      Download the PDF
    </a>
  );
}
