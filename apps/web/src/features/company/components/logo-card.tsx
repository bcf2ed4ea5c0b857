import { useId, useRef, useState } from 'react';
import { toast } from 'sonner';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field-error';
import { FormAlert } from '@/components/ui/form-alert';
import { useRemoveLogo, useUploadLogo, type Company } from '../api';

/** The server's limit (apps/server/src/modules/company/logo-image.ts); checked here too so a big file fails at once. */
const MAX_LOGO_BYTES = 2 * 1024 * 1024;

export function LogoCard({ company }: { company: Company }) {
  const inputId = useId();
  const hintId = useId();
  const inputRef = useRef<HTMLInputElement>(null);
  const [localError, setLocalError] = useState<string | undefined>();
  const upload = useUploadLogo();
  const remove = useRemoveLogo();

  const onFile = (file: File | undefined) => {
    setLocalError(undefined);
    upload.reset();
    if (!file) return;
    if (file.size > MAX_LOGO_BYTES) {
      setLocalError('This file is larger than 2 MB. Save a smaller copy and try again.');
      return;
    }
    upload.mutate(file, {
      onSuccess: () => toast.success('Logo saved. It appears on reports, e-mails and the portal.'),
      onSettled: () => {
        if (inputRef.current) inputRef.current.value = '';
      },
    });
  };

  return (
    <div className="space-y-4">
      <div className="flex min-h-32 items-center justify-center rounded-lg border border-dashed border-line-strong bg-paper p-4">
        {company.logo ? (
          <img
            src={company.logo.url}
            alt={`${company.profile.name} logo`}
            width={company.logo.width}
            height={company.logo.height}
            className="max-h-24 w-auto max-w-full object-contain"
          />
        ) : (
          <p className="text-center text-sm text-ink-muted">No logo yet. Reports and e-mails show the company name on its own.</p>
        )}
      </div>
      <FormAlert error={upload.error} />
      <div className="space-y-1.5">
        <label htmlFor={inputId} className="block text-sm font-semibold">
          {company.logo ? 'Replace the logo' : 'Upload a logo'}
        </label>
        <p id={hintId} className="text-sm text-ink-muted">
          PNG, JPEG or WebP, up to 2 MB. We fit it within 600 × 240 pixels and remove hidden details such as location.
        </p>
        <input
          ref={inputRef}
          id={inputId}
          type="file"
          accept="image/png,image/jpeg,image/webp"
          aria-describedby={hintId}
          disabled={upload.isPending}
          onChange={(e) => onFile(e.target.files?.[0])}
          className="block w-full text-sm file:mr-3 file:min-h-11 file:cursor-pointer file:rounded-lg file:border file:border-line-strong file:bg-sheet file:px-4 file:font-semibold file:text-ink hover:file:bg-sand"
        />
        <FieldError message={localError} />
        {upload.isPending ? <p className="text-sm text-ink-muted">Checking and saving the picture…</p> : null}
      </div>
      {company.logo ? (
        <Button
          variant="secondary"
          size="sm"
          pending={remove.isPending}
          onClick={() => remove.mutate(undefined, { onSuccess: () => toast.success('Logo removed.') })}
        >
          Remove the logo
        </Button>
      ) : null}
    </div>
  );
}
