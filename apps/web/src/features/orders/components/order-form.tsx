import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import {
  formatMoney,
  makeOrderCreateSchema,
  orderingSideOf,
  propertyTypeNames,
  propertyTypes,
  type OrderCreate,
  type OrderCreateInput,
  type OrderKind,
  type PartyRole,
} from '@underfoot/core';
import { useMemo, useState } from 'react';
import { Controller, useFieldArray, useForm, useWatch, type Control, type DefaultValues } from 'react-hook-form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { FieldError } from '@/components/ui/field-error';
import { FormAlert } from '@/components/ui/form-alert';
import { SelectField, TextAreaField } from '@/components/ui/form-fields';
import { SectionLoading } from '@/components/ui/spinner';
import { TextField, inputClasses } from '@/components/ui/text-field';
import { errorMessage, isApiError } from '@/lib/api-client';
import { feeListQueryOptions, useCreateOrder, type OrderDetail } from '../api';
import { ChoiceCard, FormSection } from './fields';
import { applyOrderServerErrors } from './order-form-errors';
import { addDaysIso, formatDay, localTodayIso } from './order-format';

export const MAX_PREFERRED_DATES = 3;

const kindChoices: Record<OrderKind, { title: string; description: string }> = {
  pre_purchase: {
    title: 'Pre-purchase',
    description:
      'For a buyer: the line is inspected before the sale closes, inside the inspection contingency, so there is time to negotiate.',
  },
  pre_listing: {
    title: 'Pre-listing',
    description: 'For a seller: the line is inspected before the home is listed, and the report can be shared with every interested buyer.',
  },
};

/** The other side's role for the same place in the sale: buyer ↔ seller, buyer's agent ↔ listing agent. */
const mirrorRole: Record<PartyRole, PartyRole> = {
  buyer: 'seller',
  seller: 'buyer',
  buyers_agent: 'listing_agent',
  listing_agent: 'buyers_agent',
};

export function clientRoleOf(kind: OrderKind): PartyRole {
  return orderingSideOf(kind) === 'buyer' ? 'buyer' : 'seller';
}

/** The optional people: the other side's agent and client. */
function otherSideRoles(kind: OrderKind): { agent: PartyRole; client: PartyRole } {
  return orderingSideOf(kind) === 'buyer' ? { agent: 'listing_agent', client: 'seller' } : { agent: 'buyers_agent', client: 'buyer' };
}

const roleWords: Record<PartyRole, { the: string; hint: string }> = {
  buyer: { the: 'The buyer', hint: 'We e-mail them an invitation to follow the order and read the report on their phone.' },
  seller: { the: 'The seller', hint: 'We e-mail them an invitation to follow the order and read the report on their phone.' },
  buyers_agent: { the: "The buyer's agent", hint: 'They can follow the order; the report reaches them when your side shares it.' },
  listing_agent: { the: 'The listing agent', hint: 'They can follow the order; the report reaches them when your side shares it.' },
};

export interface OrderPlaced {
  order: OrderDetail;
  payNow: boolean;
}

function emptyValues(kind: OrderKind, payer: OrderCreateInput['payer'] | undefined): DefaultValues<OrderCreateInput> {
  return {
    kind,
    property: {
      address: { street: '', unit: '', city: '', region: '', postalCode: '' },
      yearBuilt: '',
      // No property type or occupancy by default: the person says what the house is and whether anyone lives there.
      accessNotes: '',
    },
    contingencyDeadline: '',
    preferredDates: [],
    addOnIds: [],
    parties: [{ partyRole: clientRoleOf(kind), name: '', email: '' }],
    ...(payer ? { payer } : {}),
    note: '',
  };
}

function PreferredDates({ control, min }: { control: Control<OrderCreateInput, unknown, OrderCreate>; min: string }) {
  return (
    <Controller
      control={control}
      name="preferredDates"
      render={({ field, fieldState }) => {
        const dates = field.value ?? [];
        const itemErrors = Array.isArray(fieldState.error) ? (fieldState.error as ({ message?: string } | undefined)[]) : [];
        return (
          <div className="space-y-2" role="group" aria-labelledby="preferred-dates-label">
            <p id="preferred-dates-label" className="text-sm font-semibold text-ink">
              Preferred visit dates <span className="font-normal text-ink-muted">(optional, up to {MAX_PREFERRED_DATES})</span>
            </p>
            {dates.map((date, i) => (
              <div key={i} className="space-y-1.5">
                <div className="flex items-center gap-2">
                  <input
                    type="date"
                    aria-label={`Preferred date ${i + 1}`}
                    min={min}
                    value={date}
                    aria-invalid={itemErrors[i]?.message ? true : undefined}
                    className={`${inputClasses} max-w-56`}
                    onChange={(e) => field.onChange(dates.map((d, j) => (j === i ? e.target.value : d)))}
                    onBlur={field.onBlur}
                  />
                  <Button variant="quiet" size="sm" onClick={() => field.onChange(dates.filter((_, j) => j !== i))}>
                    Remove<span className="sr-only"> preferred date {i + 1}</span>
                  </Button>
                </div>
                <FieldError message={itemErrors[i]?.message} />
              </div>
            ))}
            {dates.length < MAX_PREFERRED_DATES ? (
              <Button variant="secondary" size="sm" onClick={() => field.onChange([...dates, ''])}>
                Add a preferred date
              </Button>
            ) : null}
            <FieldError message={fieldState.error?.message} />
          </div>
        );
      }}
    />
  );
}

/**
 * The order form for agents and the office. The core's schema checks it in the
 * browser; the server checks it again and its field errors land on the same fields.
 */
export function OrderForm({
  canPayNow,
  onPlaced,
  busyLabel,
}: {
  /** Agents may pay by card at once; the office cannot pay (PRODUCT.md §10). */
  canPayNow: boolean;
  onPlaced: (placed: OrderPlaced) => void;
  /** Shown on the submit button while the page moves on (e.g. to the checkout). */
  busyLabel?: string | null;
}) {
  const today = localTodayIso();
  const schema = useMemo(() => makeOrderCreateSchema(today), [today]);
  const form = useForm<OrderCreateInput, unknown, OrderCreate>({
    resolver: zodResolver(schema),
    defaultValues: emptyValues('pre_purchase', canPayNow ? undefined : 'client_before_release'),
  });
  const { errors } = form.formState;
  const parties = useFieldArray({ control: form.control, name: 'parties' });
  const kind = useWatch({ control: form.control, name: 'kind' }) ?? 'pre_purchase';
  const addOnIds = useWatch({ control: form.control, name: 'addOnIds' });
  const preferredDates = useWatch({ control: form.control, name: 'preferredDates' });
  const deadline = useWatch({ control: form.control, name: 'contingencyDeadline' });
  const feeList = useQuery(feeListQueryOptions());
  const createOrder = useCreateOrder();
  const [unmatched, setUnmatched] = useState<string[]>([]);
  const [duplicateWarning, setDuplicateWarning] = useState<string | null>(null);
  const [confirmDuplicate, setConfirmDuplicate] = useState(false);

  const baseFee = feeList.data?.find((f) => f.kind === 'base');
  const addOns = feeList.data?.filter((f) => f.kind === 'add_on') ?? [];
  const chosen = new Set(Array.isArray(addOnIds) ? addOnIds : []);
  const total = (baseFee?.priceCents ?? 0) + addOns.filter((a) => chosen.has(a.id)).reduce((sum, a) => sum + a.priceCents, 0);
  const other = otherSideRoles(kind);
  const clientRole = clientRoleOf(kind);

  const changeKind = (next: OrderKind) => {
    // Everyone invited stays, in the matching place of the other kind of sale.
    const current = form.getValues('parties');
    if (current[0] && current[0].partyRole !== clientRoleOf(next)) {
      current.forEach((p, i) => form.setValue(`parties.${i}.partyRole`, mirrorRole[p.partyRole]));
    }
  };

  const onSubmit = form.handleSubmit((values) => {
    setUnmatched([]);
    const duplicateAcknowledged = duplicateWarning !== null && confirmDuplicate;
    createOrder.mutate(
      { ...values, ...(duplicateAcknowledged ? { confirmDuplicate: true as const } : {}) },
      {
        onSuccess: (order) => {
          setDuplicateWarning(null);
          onPlaced({ order, payNow: values.payer === 'agent_now' });
        },
        onError: (error) => {
          if (isApiError(error, 409) && error.code === 'duplicate_property') {
            setDuplicateWarning(error.detail);
            setConfirmDuplicate(false);
            return;
          }
          setUnmatched(
            applyOrderServerErrors(error, form.setError, {
              parties: form.getValues('parties').length,
              preferredDates: form.getValues('preferredDates')?.length ?? 0,
            }),
          );
        },
      },
    );
  });

  const partyErrors = errors.parties;
  const partiesMessage = partyErrors?.root?.message ?? partyErrors?.message;
  const showFormAlert = createOrder.isError && !(isApiError(createOrder.error, 409) && createOrder.error.code === 'duplicate_property');
  const pending = createOrder.isPending || Boolean(busyLabel);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {showFormAlert ? <FormAlert error={createOrder.error} extra={unmatched} /> : null}

      <FormSection number={1} title="Kind of inspection" error={errors.kind?.message}>
        <div className="grid gap-3 sm:grid-cols-2">
          {(Object.keys(kindChoices) as OrderKind[]).map((k) => (
            <ChoiceCard
              key={k}
              value={k}
              title={kindChoices[k].title}
              description={kindChoices[k].description}
              {...form.register('kind', { onChange: (e: { target: { value: OrderKind } }) => changeKind(e.target.value) })}
            />
          ))}
        </div>
      </FormSection>

      <FormSection number={2} title="The property">
        <TextField
          label="Street address"
          autoComplete="address-line1"
          error={errors.property?.address?.street?.message}
          {...form.register('property.address.street')}
        />
        <TextField
          label={
            <>
              Unit <span className="font-normal text-ink-muted">(optional)</span>
            </>
          }
          autoComplete="address-line2"
          className="max-w-xs"
          error={errors.property?.address?.unit?.message}
          {...form.register('property.address.unit')}
        />
        <div className="grid gap-4 sm:grid-cols-[2fr_1fr_1fr]">
          <TextField
            label="City"
            autoComplete="address-level2"
            error={errors.property?.address?.city?.message}
            {...form.register('property.address.city')}
          />
          <TextField
            label="State or region"
            autoComplete="address-level1"
            error={errors.property?.address?.region?.message}
            {...form.register('property.address.region')}
          />
          <TextField
            label="Postal code"
            autoComplete="postal-code"
            autoCapitalize="characters"
            error={errors.property?.address?.postalCode?.message}
            {...form.register('property.address.postalCode')}
          />
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            label="Year built"
            inputMode="numeric"
            className="numeric"
            hint="An estimate is fine: it tells the inspector which pipe materials to expect."
            error={errors.property?.yearBuilt?.message}
            {...form.register('property.yearBuilt')}
          />
          <SelectField
            label="Property type"
            hint="Condominiums and multi-family buildings often share a line."
            error={errors.property?.propertyType?.message}
            {...form.register('property.propertyType')}
          >
            <option value="">Choose…</option>
            {propertyTypes.map((t) => (
              <option key={t} value={t}>
                {propertyTypeNames[t]}
              </option>
            ))}
          </SelectField>
        </div>
        <div role="radiogroup" aria-labelledby="occupancy-label" className="space-y-2">
          <p id="occupancy-label" className="text-sm font-semibold text-ink">
            Is anyone living there?
          </p>
          <div className="grid gap-3 sm:grid-cols-2">
            <ChoiceCard
              value="occupied"
              title="Occupied"
              description="Someone lives there: the inspector arranges access with them."
              {...form.register('property.occupancy')}
            />
            <ChoiceCard
              value="vacant"
              title="Vacant"
              description="Nobody lives there: say below how the inspector gets in."
              {...form.register('property.occupancy')}
            />
          </div>
          <FieldError message={errors.property?.occupancy?.message} />
        </div>
        <TextAreaField
          label={
            <>
              Where is the cleanout, and how does the inspector get in? <span className="font-normal text-ink-muted">(optional)</span>
            </>
          }
          hint="A cleanout is the capped pipe, often near the house or the front yard, through which the camera goes in. Lockbox codes, pets and gates help too."
          error={errors.property?.accessNotes?.message}
          {...form.register('property.accessNotes')}
        />
      </FormSection>

      <FormSection number={3} title="Dates">
        <TextField
          type="date"
          label={kind === 'pre_purchase' ? 'Contingency deadline' : 'Report needed by'}
          hint={
            kind === 'pre_purchase'
              ? "The last day of the buyer's inspection contingency. It must be after today."
              : 'The day you need the report, such as the day the listing goes live. It must be after today.'
          }
          min={addDaysIso(today, 1)}
          className="max-w-64"
          error={errors.contingencyDeadline?.message}
          {...form.register('contingencyDeadline')}
        />
        <PreferredDates control={form.control} min={today} />
        {preferredDates && preferredDates.length > 0 ? (
          <p className="text-sm text-ink-muted">The office confirms the visit by e-mail; these dates are a wish, not a booking.</p>
        ) : null}
      </FormSection>

      <FormSection
        number={4}
        title="Inspection and add-ons"
        description="The camera inspection of the line from the house to the public sewer is always included. Add what else you need."
        error={errors.addOnIds?.message}
      >
        {feeList.isPending ? (
          <SectionLoading label="Loading the fee list…" />
        ) : feeList.isError ? (
          <Alert tone="danger" title="The fee list could not be loaded">
            <p>{errorMessage(feeList.error)}</p>
            <Button size="sm" variant="secondary" className="mt-2" onClick={() => void feeList.refetch()}>
              Try again
            </Button>
          </Alert>
        ) : !baseFee ? (
          <Alert tone="caution" title="The inspection fee is not set up yet">
            Orders can be placed once the office adds the inspection fee to the company&rsquo;s fee list.
          </Alert>
        ) : (
          <>
            <div className="flex items-start justify-between gap-4 rounded-lg border border-line bg-sand/60 p-3.5">
              <span className="min-w-0">
                <span className="block font-semibold">{baseFee.name}</span>
                {baseFee.description ? <span className="block text-sm text-ink-muted">{baseFee.description}</span> : null}
              </span>
              <span className="numeric shrink-0 font-semibold">{formatMoney(baseFee.priceCents)}</span>
            </div>
            {addOns.length > 0 ? (
              <div className="space-y-2" role="group" aria-label="Add-ons">
                {addOns.map((a) => (
                  <ChoiceCard
                    key={a.id}
                    type="checkbox"
                    value={a.id}
                    title={a.name}
                    description={a.description || undefined}
                    aside={<span className="numeric font-semibold">+{formatMoney(a.priceCents)}</span>}
                    {...form.register('addOnIds')}
                  />
                ))}
              </div>
            ) : null}
            <p className="flex items-baseline justify-between border-t border-line pt-3 text-lg font-bold" aria-live="polite">
              <span>Total</span>
              <span className="numeric" data-testid="order-total">
                {formatMoney(total)}
              </span>
            </p>
          </>
        )}
      </FormSection>

      <FormSection
        number={5}
        title="People to invite"
        description="Each person gets an e-mail with a link to set up their account and follow the order."
        error={partiesMessage}
      >
        {parties.fields.map((field, i) => {
          const role = form.getValues(`parties.${i}.partyRole`) ?? field.partyRole;
          const required = i === 0;
          const rowErrors = errors.parties?.[i];
          return (
            <div key={field.id} className="space-y-3 rounded-lg border border-line p-4" data-party-role={role}>
              <div className="flex items-center justify-between gap-3">
                <p className="font-semibold">
                  {roleWords[role].the}
                  {required ? null : <span className="font-normal text-ink-muted"> (optional)</span>}
                </p>
                {required ? null : (
                  <Button variant="quiet" size="sm" onClick={() => parties.remove(i)}>
                    Remove<span className="sr-only"> {roleWords[role].the.toLowerCase()}</span>
                  </Button>
                )}
              </div>
              <p className="-mt-2 text-sm text-ink-muted">{roleWords[role].hint}</p>
              <div className="grid gap-4 sm:grid-cols-2">
                <TextField
                  label={`${roleWords[role].the}'s name`}
                  autoComplete="off"
                  error={rowErrors?.name?.message ?? rowErrors?.partyRole?.message}
                  {...form.register(`parties.${i}.name`)}
                />
                <TextField
                  label={`${roleWords[role].the}'s e-mail`}
                  type="email"
                  inputMode="email"
                  autoCapitalize="none"
                  spellCheck={false}
                  autoComplete="off"
                  error={rowErrors?.email?.message}
                  {...form.register(`parties.${i}.email`)}
                />
              </div>
            </div>
          );
        })}
        <div className="flex flex-wrap gap-2">
          {([other.agent, other.client] as const).map((role) =>
            parties.fields.some((_, i) => form.getValues(`parties.${i}.partyRole`) === role) ? null : (
              <Button key={role} variant="secondary" size="sm" onClick={() => parties.append({ partyRole: role, name: '', email: '' })}>
                Add {roleWords[role].the.toLowerCase()}
              </Button>
            ),
          )}
        </div>
        {clientRole === 'buyer' ? null : (
          <p className="text-sm text-ink-muted">For a pre-listing inspection, buyers usually see the report through a shared link later.</p>
        )}
      </FormSection>

      <FormSection number={6} title="Payment" error={errors.payer?.message}>
        {canPayNow ? (
          <div role="radiogroup" aria-label="Who pays" className="grid gap-3 sm:grid-cols-2">
            <ChoiceCard
              value="agent_now"
              title="I pay now by card"
              description="You go to the secure payment page straight after placing the order."
              {...form.register('payer')}
            />
            <ChoiceCard
              value="client_before_release"
              title={`The ${clientRole} pays before release`}
              description={`The ${clientRole} pays online; the report is released once the fee is paid.`}
              {...form.register('payer')}
            />
          </div>
        ) : (
          <p>
            The {clientRole} pays online before the report is released. They find the payment button on the order once they accept their
            invitation.
          </p>
        )}
      </FormSection>

      <FormSection number={7} title="Anything else">
        <TextAreaField
          label={
            <>
              Note for the office <span className="font-normal text-ink-muted">(optional)</span>
            </>
          }
          hint="Gate codes belong with the access notes above; use this for anything else the office should know."
          error={errors.note?.message}
          {...form.register('note')}
        />
      </FormSection>

      {duplicateWarning ? (
        <Alert tone="caution" title="This address already has an open order" role="alert">
          <p>{duplicateWarning}</p>
          <label className="mt-2 flex items-center gap-2 font-semibold text-ink">
            <input
              type="checkbox"
              className="size-4 accent-brand"
              checked={confirmDuplicate}
              onChange={(e) => setConfirmDuplicate(e.target.checked)}
            />
            Order anyway
          </label>
        </Alert>
      ) : null}

      <div className="flex flex-col gap-3 sm:flex-row sm:items-center sm:justify-end">
        {baseFee ? (
          <p className="text-ink-muted sm:mr-auto">
            Total <span className="numeric font-semibold text-ink">{formatMoney(total)}</span>
            {deadline && /^\d{4}-\d{2}-\d{2}$/.test(deadline) ? ` · deadline ${formatDay(deadline)}` : null}
          </p>
        ) : null}
        <Button
          type="submit"
          pending={pending}
          disabled={!baseFee || (duplicateWarning !== null && !confirmDuplicate)}
          className="w-full sm:w-auto"
        >
          {busyLabel ?? (createOrder.isPending ? 'Placing the order…' : 'Place the order')}
        </Button>
      </div>
    </form>
  );
}
