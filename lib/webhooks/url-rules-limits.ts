/** Shared with the form schema (client code): the longest webhook address accepted. */
export const WEBHOOK_URL_MAX_LENGTH = 2_000;
