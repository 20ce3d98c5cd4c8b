/** What an API key may do. Pure, for forms and the server alike. */
export const API_KEY_SCOPES = ["readings:write"] as const;
export type ApiKeyScope = (typeof API_KEY_SCOPES)[number];

export const API_KEY_SCOPE_LABELS: Record<ApiKeyScope, { label: string; description: string }> = {
  "readings:write": { label: "Send temperature readings", description: "Loggers and gateways post readings to POST /api/v1/readings." },
};
