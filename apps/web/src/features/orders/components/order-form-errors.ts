import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from '@/lib/api-client';

/** The order form's fixed fields, named as the server names them in `errors[].path`. */
const fixedOrderFields = new Set([
  'kind',
  'property.address.street',
  'property.address.unit',
  'property.address.city',
  'property.address.region',
  'property.address.postalCode',
  'property.yearBuilt',
  'property.propertyType',
  'property.occupancy',
  'property.accessNotes',
  'contingencyDeadline',
  'preferredDates',
  'addOnIds',
  'parties',
  'payer',
  'note',
]);

export interface OrderFormShape {
  /** How many people the form currently invites. */
  parties: number;
  /** How many preferred dates the form currently holds. */
  preferredDates: number;
}

/**
 * The form field a server path belongs to, or null when the form has no such
 * field. Array paths only count while the form holds that row; a problem with
 * one add-on lands on the add-ons group, which has no field per item.
 */
export function orderFieldFor(path: string, shape: OrderFormShape): string | null {
  if (fixedOrderFields.has(path)) return path;
  const party = /^parties\.(\d+)\.(name|email|partyRole)$/.exec(path);
  if (party) {
    const index = Number(party[1]);
    if (index >= shape.parties) return null;
    // The role is chosen by the form (which block the person is in), so its message shows with the name.
    return `parties.${index}.${party[2] === 'partyRole' ? 'name' : party[2]}`;
  }
  const date = /^preferredDates\.(\d+)$/.exec(path);
  if (date) return Number(date[1]) < shape.preferredDates ? path : null;
  if (/^addOnIds\.\d+$/.test(path)) return 'addOnIds';
  return null;
}

export interface MappedServerErrors {
  fields: { name: string; message: string }[];
  /** Messages that fit no field on the form: the form-level alert lists them. */
  unmatched: string[];
}

/** Sorts the server's `errors[]` into field messages and the rest. */
export function mapOrderServerErrors(error: unknown, shape: OrderFormShape): MappedServerErrors {
  const result: MappedServerErrors = { fields: [], unmatched: [] };
  if (!(error instanceof ApiError)) return result;
  for (const fieldError of error.fieldErrors) {
    const name = orderFieldFor(fieldError.path, shape);
    // The first message for a field is the one a person needs first.
    if (name && !result.fields.some((f) => f.name === name)) result.fields.push({ name, message: fieldError.message });
    else if (!name) result.unmatched.push(fieldError.message);
  }
  return result;
}

/** Puts the server's field errors on the form (focusing the first) and returns the messages that fit no field. */
export function applyOrderServerErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  shape: OrderFormShape,
): string[] {
  const { fields, unmatched } = mapOrderServerErrors(error, shape);
  fields.forEach((field, i) => {
    setError(field.name as Path<T>, { type: 'server', message: field.message }, { shouldFocus: i === 0 });
  });
  return unmatched;
}
