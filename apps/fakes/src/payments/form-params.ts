import { invalidRequest, missingParam } from './provider-error.ts';

/**
 * Readers for the SDK's form-encoded parameters after bracket parsing (`a[b][0]=x` → nested objects and
 * arrays of strings). Every value arrives as a string; these check and convert it the way the real API does,
 * naming the offending parameter in the error.
 */
export type FormValue = string | FormValue[] | { [key: string]: FormValue };
export type FormObject = { [key: string]: FormValue };

export const isObject = (value: unknown): value is FormObject => typeof value === 'object' && value !== null && !Array.isArray(value);

export function readObject(value: unknown, param: string): FormObject | undefined {
  if (value === undefined || value === '') return undefined;
  if (!isObject(value)) throw invalidRequest(`Invalid object: ${param} must be a hash of parameters.`, param);
  return value;
}

export function readArray(value: unknown, param: string): FormValue[] | undefined {
  if (value === undefined || value === '') return undefined;
  if (!Array.isArray(value)) throw invalidRequest(`Invalid array: ${param} must be a list with indexes 0, 1, 2….`, param);
  return value as FormValue[];
}

export function readString(value: unknown, param: string, maxLength = 5000): string | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== 'string') throw invalidRequest(`Invalid string: ${param} must be a string.`, param);
  if (value.length > maxLength) throw invalidRequest(`Invalid string: ${param} must be at most ${maxLength} characters long.`, param);
  return value;
}

export function requireString(value: unknown, param: string, maxLength?: number): string {
  const text = readString(value, param, maxLength);
  if (text === undefined || text === '') throw missingParam(param);
  return text;
}

export function readInteger(value: unknown, param: string, min: number, max: number): number | undefined {
  const text = readString(value, param);
  if (text === undefined || text === '') return undefined;
  if (!/^-?\d+$/.test(text)) throw invalidRequest(`Invalid integer: ${text}`, param, 'parameter_invalid_integer');
  const n = Number(text);
  if (n < min) throw invalidRequest(`This value must be greater than or equal to ${min}.`, param, 'parameter_invalid_integer');
  if (n > max) throw invalidRequest(`This value must be less than or equal to ${max}.`, param, 'parameter_invalid_integer');
  return n;
}

export function readUrl(value: unknown, param: string): string | undefined {
  const text = readString(value, param);
  if (text === undefined || text === '') return undefined;
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    throw invalidRequest('Not a valid URL', param, 'url_invalid');
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') throw invalidRequest('Not a valid URL', param, 'url_invalid');
  return text;
}

/** Metadata as the real API limits it: up to 50 keys, keys ≤ 40 chars, values ≤ 500 chars; an empty value unsets a key. */
export function readMetadata(value: unknown, param: string): Record<string, string> {
  const hash = readObject(value, param);
  const out: Record<string, string> = {};
  if (!hash) return out;
  const keys = Object.keys(hash);
  if (keys.length > 50) throw invalidRequest('Metadata can have at most 50 keys.', param);
  for (const key of keys) {
    if (key.length > 40) throw invalidRequest(`Metadata keys can have at most 40 characters ('${key}').`, `${param}[${key}]`);
    const text = readString(hash[key], `${param}[${key}]`, 500);
    if (text) out[key] = text;
  }
  return out;
}
