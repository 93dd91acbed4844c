// Limits the job page shows beside its fields (no zod: it ships to the browser).

/** Hours one person may record for one day: a quarter hour up to a double shift, in quarter hours. */
export const MIN_HOURS = 0.25;
export const MAX_HOURS = 16;
