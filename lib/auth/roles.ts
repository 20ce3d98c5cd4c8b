/** The five roles of Headroom. Pure, so forms and the client may import it. */
export const ROLES = ["admin", "safety_officer", "researcher", "facilities", "auditor"] as const;
export type Role = (typeof ROLES)[number];
