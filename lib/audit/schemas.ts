import { z } from "zod";
import { listQuerySchema } from "@/lib/http/list-query";
import { optionalDate } from "@/lib/validation/fields";

export const auditListQuerySchema = listQuerySchema({
  sortable: ["at"],
  defaultSort: "at",
  defaultDir: "desc",
  filters: {
    q: z.string().trim().max(200, "q is at most 200 characters.").optional(),
    entityType: z.enum(["container", "room", "storage_unit", "site", "substance", "mixture", "user", "installation", "finding", "sensor", "api_key"], { error: "Unknown record type." }).optional(),
    entityId: z.string().trim().max(40).optional(),
    action: z.string().trim().max(40).optional(),
    actor: z.string().trim().max(254).optional(),
    from: optionalDate("from"),
    to: optionalDate("to"),
  },
});
export type AuditListQuery = z.output<typeof auditListQuerySchema>;
