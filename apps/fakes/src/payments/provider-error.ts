export type ProviderErrorType = 'invalid_request_error' | 'authentication_error' | 'idempotency_error' | 'api_error';

/**
 * An error answered in the provider's own error shape, `{ error: { type, code, message, param } }`,
 * which the SDK turns into its typed errors (400/404 → StripeInvalidRequestError, 401 → StripeAuthenticationError…).
 */
export class ProviderError extends Error {
  constructor(
    readonly status: number,
    readonly type: ProviderErrorType,
    message: string,
    readonly detail: { param?: string; code?: string } = {},
  ) {
    super(message);
  }

  toBody() {
    return { error: { type: this.type, message: this.message, ...this.detail } };
  }
}

export const invalidRequest = (message: string, param?: string, code?: string) =>
  new ProviderError(400, 'invalid_request_error', message, {
    ...(code ? { code } : {}),
    ...(param ? { param } : {}),
  });

export const missingParam = (param: string) => invalidRequest(`Missing required param: ${param}.`, param, 'parameter_missing');

export const noSuchObject = (kind: string, id: string, param: string, status = 400) =>
  new ProviderError(status, 'invalid_request_error', `No such ${kind}: '${id}'`, { code: 'resource_missing', param });
