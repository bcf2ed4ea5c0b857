import { describe, expect, it } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { mapOrderServerErrors, orderFieldFor } from './order-form-errors';

function validationError(errors: { path: string; message: string }[]) {
  return new ApiError({
    type: 'about:blank',
    title: 'Bad Request',
    status: 400,
    code: 'validation_failed',
    detail: 'Some fields need attention.',
    errors,
  });
}

describe('orderFieldFor', () => {
  const shape = { parties: 2, preferredDates: 1 };

  it('keeps nested property paths as they are', () => {
    expect(orderFieldFor('property.address.street', shape)).toBe('property.address.street');
    expect(orderFieldFor('property.address.postalCode', shape)).toBe('property.address.postalCode');
    expect(orderFieldFor('property.yearBuilt', shape)).toBe('property.yearBuilt');
    expect(orderFieldFor('contingencyDeadline', shape)).toBe('contingencyDeadline');
  });

  it('finds the row of an invited person only while the form has that row', () => {
    expect(orderFieldFor('parties.0.email', shape)).toBe('parties.0.email');
    expect(orderFieldFor('parties.1.name', shape)).toBe('parties.1.name');
    expect(orderFieldFor('parties.2.email', shape)).toBeNull();
  });

  it('shows a problem with the role next to the name, since the form picks the role', () => {
    expect(orderFieldFor('parties.1.partyRole', shape)).toBe('parties.1.name');
  });

  it('maps preferred dates by index and add-on problems onto the add-on group', () => {
    expect(orderFieldFor('preferredDates.0', shape)).toBe('preferredDates.0');
    expect(orderFieldFor('preferredDates.1', shape)).toBeNull();
    expect(orderFieldFor('addOnIds.3', shape)).toBe('addOnIds');
  });

  it('knows no field for paths the form does not have', () => {
    expect(orderFieldFor('property.address', shape)).toBeNull();
    expect(orderFieldFor('captcha', shape)).toBeNull();
    expect(orderFieldFor('parties.x.email', shape)).toBeNull();
  });
});

describe('mapOrderServerErrors', () => {
  it('sorts the server’s errors into field messages and the rest, first message per field', () => {
    const mapped = mapOrderServerErrors(
      validationError([
        { path: 'property.address.postalCode', message: 'Enter a postal code, like 97035.' },
        { path: 'parties.0.email', message: 'This address cannot be added to an order here.' },
        { path: 'parties.0.email', message: 'A second message for the same field.' },
        { path: 'addOnIds.0', message: 'This add-on is no longer offered.' },
        { path: 'somethingElse', message: 'A rule the form cannot show on a field.' },
      ]),
      { parties: 1, preferredDates: 0 },
    );
    expect(mapped.fields).toEqual([
      { name: 'property.address.postalCode', message: 'Enter a postal code, like 97035.' },
      { name: 'parties.0.email', message: 'This address cannot be added to an order here.' },
      { name: 'addOnIds', message: 'This add-on is no longer offered.' },
    ]);
    expect(mapped.unmatched).toEqual(['A rule the form cannot show on a field.']);
  });

  it('maps nothing for errors that are not API problems', () => {
    expect(mapOrderServerErrors(new Error('boom'), { parties: 1, preferredDates: 0 })).toEqual({ fields: [], unmatched: [] });
  });
});
