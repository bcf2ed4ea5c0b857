/** Times are stored as ISO-8601 UTC strings (see the first migration). */
export const nowIso = (): string => new Date().toISOString();
export const isoIn = (ms: number): string => new Date(Date.now() + ms).toISOString();
