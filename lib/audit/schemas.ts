import { z } from "zod";
import { listQuerySchema } from "@/lib/http/list-query";
import { optionalDate } from "@/lib/validation/fields";
import { AUDIT_ENTITY_TYPES } from "./format";

export const auditListQuerySchema = listQuerySchema({
  sortable: ["at"],
  defaultSort: "at",
  defaultDir: "desc",
  filters: {
    q: z.string().trim().max(200, "q is at most 200 characters.").optional(),
    entityType: z.enum(AUDIT_ENTITY_TYPES, { error: `Unknown record type: choose one of ${AUDIT_ENTITY_TYPES.join(", ")}.` }).optional(),
    entityId: z.string().trim().max(40).optional(),
    action: z.string().trim().max(40).optional(),
    actor: z.string().trim().max(254).optional(),
    from: optionalDate("from"),
    to: optionalDate("to"),
  },
});
export type AuditListQuery = z.output<typeof auditListQuerySchema>;
