import { agentSignupModeLabels, agentSignupModes, type AgentSignupMode } from '@underfoot/core';
import { useId, useState } from 'react';
import { toast } from 'sonner';
import { Button } from '@/components/ui/button';
import { FormAlert } from '@/components/ui/form-alert';
import { inputClasses } from '@/components/ui/text-field';
import { cn } from '@/lib/cn';
import { useSaveSettings, type Company } from '../api';

const descriptions: Record<AgentSignupMode, string> = {
  invite_only: 'Agents get an account when you invite them here, or when they are added to an order.',
  self_signup: 'Agents can also create an account from your sign-up page, after confirming their e-mail address.',
};

/** How agents join the company: the office chooses (PRODUCT.md §2, issue: "the company can choose which"). */
export function AgentSignupCard({ company }: { company: Company }) {
  const save = useSaveSettings();
  const linkId = useId();
  const [copied, setCopied] = useState(false);
  const current = company.settings.agentSignup;

  const choose = (mode: AgentSignupMode) => {
    if (mode === current) return;
    save.mutate(
      { agentSignup: mode },
      {
        onSuccess: () => toast.success(mode === 'self_signup' ? 'Agents can now sign up themselves.' : 'Only invited agents can join now.'),
      },
    );
  };

  return (
    <div className="space-y-4">
      <FormAlert error={save.error} />
      <fieldset className="space-y-2" disabled={save.isPending}>
        <legend className="sr-only">How agents join</legend>
        {agentSignupModes.map((mode) => (
          <label
            key={mode}
            className={cn(
              'flex cursor-pointer items-start gap-3 rounded-lg border border-line-strong bg-white p-3.5 hover:border-ink-muted',
              'has-checked:border-brand has-checked:bg-brand-soft/40',
            )}
          >
            <input
              type="radio"
              name="agentSignup"
              value={mode}
              checked={current === mode}
              onChange={() => choose(mode)}
              className="mt-1 size-4 shrink-0 accent-brand"
            />
            <span>
              <span className="block font-semibold">{agentSignupModeLabels[mode]}</span>
              <span className="block text-sm text-ink-muted">{descriptions[mode]}</span>
            </span>
          </label>
        ))}
      </fieldset>
      {company.agentSignUpUrl ? (
        <div className="space-y-1.5">
          <label htmlFor={linkId} className="block text-sm font-semibold">
            Your sign-up page for agents
          </label>
          <div className="flex flex-col gap-2 sm:flex-row">
            <input
              id={linkId}
              readOnly
              value={company.agentSignUpUrl}
              className={cn(inputClasses, 'font-mono text-sm')}
              onFocus={(e) => e.target.select()}
            />
            <Button
              variant="secondary"
              onClick={() => {
                void navigator.clipboard?.writeText(company.agentSignUpUrl ?? '').then(
                  () => setCopied(true),
                  () => toast.error('Copy the address by hand; the browser did not allow copying.'),
                );
              }}
            >
              {copied ? 'Copied' : 'Copy link'}
            </Button>
          </div>
          <p className="text-sm text-ink-muted">Share it with the agents you work with, for example in your e-mail signature.</p>
        </div>
      ) : null}
    </div>
  );
}
