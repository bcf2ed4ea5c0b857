import { useQueryClient } from '@tanstack/react-query';
import { isStaffRole, staffRoles, type StaffRole } from '@underfoot/core';
import { useId, useMemo, useState } from 'react';
import { toast } from 'sonner';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { CardList, WideTable } from '@/components/ui/data-table';
import { ConfirmDialog } from '@/components/ui/dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { compactSelectClasses, FilterInput } from '@/components/ui/form-fields';
import { roleLabels } from '@/config/roles';
import { errorMessage } from '@/lib/api-client';
import { sessionKeys } from '@/lib/auth';
import { cn } from '@/lib/cn';
import { formatDateTime } from '@/lib/format';
import { usePersonAction, type Person } from '../api';
import { PersonStatusBadge } from './person-status';

type Group = 'staff' | 'agent' | 'client' | 'all';
const groupLabels: Record<Group, string> = { staff: 'Staff', agent: 'Agents', client: 'Buyers and sellers', all: 'Everyone' };
const inGroup = (person: Person, group: Group) => group === 'all' || (group === 'staff' ? isStaffRole(person.role) : person.role === group);

function RoleControl({ person, onChange, busy }: { person: Person; onChange: (role: StaffRole) => void; busy: boolean }) {
  const id = useId();
  if (!person.allowed.changeRole || !isStaffRole(person.role)) return <span>{roleLabels[person.role]}</span>;
  return (
    <>
      <label htmlFor={id} className="sr-only">
        Role of {person.name}
      </label>
      <select
        id={id}
        value={person.role}
        disabled={busy}
        onChange={(e) => onChange(e.target.value as StaffRole)}
        className={compactSelectClasses}
      >
        {staffRoles.map((role) => (
          <option key={role} value={role}>
            {roleLabels[role]}
          </option>
        ))}
      </select>
    </>
  );
}

function LastSignIn({ person }: { person: Person }) {
  if (person.status === 'invited') return <span className="text-ink-muted">Not yet accepted</span>;
  return <span className="numeric text-ink-muted">{person.lastSignInAt ? formatDateTime(person.lastSignInAt) : 'Never'}</span>;
}

export function PeopleList({ people }: { people: Person[] }) {
  const [group, setGroup] = useState<Group>('staff');
  const [search, setSearch] = useState('');
  const [confirming, setConfirming] = useState<Person | null>(null);
  const [problem, setProblem] = useState<{ name: string; error: unknown } | null>(null);
  const action = usePersonAction();
  const queryClient = useQueryClient();

  const shown = useMemo(() => {
    const needle = search.trim().toLowerCase();
    return people.filter((p) => inGroup(p, group) && (!needle || `${p.name} ${p.email}`.toLowerCase().includes(needle)));
  }, [people, group, search]);

  const run = (person: Person, variables: Parameters<typeof action.mutate>[0], done: string) => {
    setProblem(null);
    action.mutate(variables, {
      onSuccess: () => {
        toast.success(done);
        // A change to one's own account changes what this browser may show.
        if (person.isYou) void queryClient.invalidateQueries({ queryKey: sessionKeys.me });
      },
      onError: (error) => setProblem({ name: person.name, error }),
      onSettled: () => setConfirming(null),
    });
  };

  const busyWith = (person: Person) => action.isPending && action.variables?.id === person.id;

  const actions = (person: Person) => (
    <div className="flex flex-wrap gap-2">
      {person.allowed.resendInvitation ? (
        <Button
          size="sm"
          variant="secondary"
          pending={busyWith(person) && action.variables?.kind === 'resend'}
          onClick={() => run(person, { kind: 'resend', id: person.id }, `A fresh invitation is on its way to ${person.email}.`)}
        >
          Resend invitation
        </Button>
      ) : null}
      {person.allowed.disable ? (
        <Button size="sm" variant="secondary" onClick={() => setConfirming(person)}>
          Disable
        </Button>
      ) : null}
      {person.allowed.enable ? (
        <Button
          size="sm"
          variant="secondary"
          pending={busyWith(person) && action.variables?.kind === 'enable'}
          onClick={() => run(person, { kind: 'enable', id: person.id }, `${person.name} can sign in again.`)}
        >
          Re-enable
        </Button>
      ) : null}
    </div>
  );

  const changeRole = (person: Person, role: StaffRole) =>
    run(person, { kind: 'role', id: person.id, role }, `${person.name} is now ${role === 'office' ? 'an office user' : 'an inspector'}.`);

  const counts = (g: Group) => people.filter((p) => inGroup(p, g)).length;

  return (
    <div className="space-y-4">
      <div className="flex flex-col gap-3 md:flex-row md:items-end md:justify-between">
        <div role="group" aria-label="Show" className="flex flex-wrap gap-1">
          {(Object.keys(groupLabels) as Group[]).map((g) => (
            <button
              key={g}
              type="button"
              aria-pressed={group === g}
              onClick={() => setGroup(g)}
              className={cn(
                'inline-flex min-h-9 items-center gap-1.5 rounded-lg border px-3 text-sm font-semibold',
                group === g ? 'border-brand bg-brand-soft text-brand-strong' : 'border-line-strong bg-sheet text-ink hover:bg-sand',
              )}
            >
              {groupLabels[g]}
              <span className="numeric text-ink-muted">{counts(g)}</span>
            </button>
          ))}
        </div>
        <FilterInput
          label="Find a person"
          className="md:w-72"
          type="search"
          value={search}
          onChange={(e) => setSearch(e.target.value)}
          placeholder="Name or e-mail"
        />
      </div>

      {problem ? (
        <Alert tone="danger" title={`Nothing was changed for ${problem.name}`}>
          <p>{errorMessage(problem.error)}</p>
        </Alert>
      ) : null}

      {shown.length === 0 ? (
        <EmptyState title={search ? 'Nobody matches' : `No ${groupLabels[group].toLowerCase()} yet`}>
          <p>{search ? `Nobody here matches “${search.trim()}”.` : 'People appear here once they are invited or added to an order.'}</p>
        </EmptyState>
      ) : (
        <>
          <WideTable caption="People in the company">
            <thead className="border-b border-line bg-sand/60 text-sm text-ink-muted">
              <tr>
                <th scope="col" className="px-3 py-2.5 pl-4 font-semibold">
                  Person
                </th>
                <th scope="col" className="px-3 py-2.5 font-semibold">
                  Role
                </th>
                <th scope="col" className="px-3 py-2.5 font-semibold">
                  Status
                </th>
                <th scope="col" className="px-3 py-2.5 font-semibold">
                  Last sign-in
                </th>
                <th scope="col" className="px-3 py-2.5 font-semibold">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {shown.map((person) => (
                <tr key={person.id} className="border-b border-line align-middle last:border-b-0">
                  <td className="px-3 py-3 pl-4">
                    <span className="block font-semibold">
                      {person.name}
                      {person.isYou ? (
                        <span className="ml-2 rounded bg-accent-soft px-1.5 py-0.5 text-xs font-semibold text-accent-strong">You</span>
                      ) : null}
                    </span>
                    <span className="block text-sm break-all text-ink-muted">{person.email}</span>
                  </td>
                  <td className="px-3 py-3">
                    <RoleControl person={person} busy={busyWith(person)} onChange={(role) => changeRole(person, role)} />
                  </td>
                  <td className="px-3 py-3">
                    <PersonStatusBadge status={person.status} />
                  </td>
                  <td className="px-3 py-3 text-sm">
                    <LastSignIn person={person} />
                  </td>
                  <td className="px-3 py-3">{actions(person)}</td>
                </tr>
              ))}
            </tbody>
          </WideTable>

          <CardList label="People in the company">
            {shown.map((person) => (
              <li key={person.id} className="rounded-card border border-line bg-sheet p-4 shadow-sheet">
                <div className="flex items-start justify-between gap-3">
                  <div className="min-w-0">
                    <p className="font-semibold break-words">
                      {person.name}
                      {person.isYou ? (
                        <span className="ml-2 rounded bg-accent-soft px-1.5 py-0.5 text-xs font-semibold text-accent-strong">You</span>
                      ) : null}
                    </p>
                    <p className="text-sm break-all text-ink-muted">{person.email}</p>
                  </div>
                  <PersonStatusBadge status={person.status} />
                </div>
                <div className="mt-3 flex flex-wrap items-center gap-x-4 gap-y-2 text-sm">
                  <RoleControl person={person} busy={busyWith(person)} onChange={(role) => changeRole(person, role)} />
                  <LastSignIn person={person} />
                </div>
                <div className="mt-3">{actions(person)}</div>
              </li>
            ))}
          </CardList>
        </>
      )}

      <ConfirmDialog
        open={confirming !== null}
        title={confirming ? `Disable ${confirming.name}?` : 'Disable'}
        confirmLabel="Disable the account"
        pending={action.isPending}
        onCancel={() => setConfirming(null)}
        onConfirm={() =>
          confirming && run(confirming, { kind: 'disable', id: confirming.id }, `${confirming.name} is disabled and signed out everywhere.`)
        }
      >
        <p>They are signed out on every device at once and cannot sign in until you re-enable the account.</p>
        <p>Their orders, inspections and the audit trail stay as they are.</p>
      </ConfirmDialog>
    </div>
  );
}
