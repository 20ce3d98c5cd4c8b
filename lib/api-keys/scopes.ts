/** What an API key may do. Pure, for forms and the server alike. */
export const API_KEY_SCOPES = ["readings:write"] as const;
export type ApiKeyScope = (typeof API_KEY_SCOPES)[number];
