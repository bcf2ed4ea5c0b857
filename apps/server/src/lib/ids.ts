import { createHash, randomBytes, randomUUID } from 'node:crypto';

export const newId = (): string => randomUUID();

/** A URL-safe secret for one-time links (256 bits). */
export const newSecretToken = (): string => randomBytes(32).toString('base64url');

/** Tokens are stored only as their SHA-256, so a database leak does not hand out working links. */
export const hashToken = (token: string): string => createHash('sha256').update(token).digest('hex');
