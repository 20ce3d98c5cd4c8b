import { z } from "zod";
import { pagingSchema } from "./paging";

/**
 * The query string every list endpoint reads: page, pageSize, sort, dir and the endpoint's own
 * filters. Safe to import in client code (zod only), so a table can share the sort keys' type.
 */

export const SORT_DIRECTIONS = ["asc", "desc"] as const;
export type SortDirection = (typeof SORT_DIRECTIONS)[number];

/** The body of every list answer. */
export type ListPage<Row> = { data: Row[]; page: number; pageSize: number; total: number };

type SortKeys = readonly [string, ...string[]];

export function listQuerySchema<const K extends SortKeys, F extends z.ZodRawShape = Record<never, never>>(spec: {
  sortable: K;
  defaultSort: K[number];
  defaultDir?: SortDirection;
  filters?: F;
}) {
  const sortMessage = `sort must be one of: ${spec.sortable.join(", ")}.`;
  return pagingSchema.extend({
    sort: z.enum(spec.sortable as unknown as readonly [K[number], ...K[number][]], { error: sortMessage }).default(spec.defaultSort),
    dir: z.enum(SORT_DIRECTIONS, { error: "dir must be asc or desc." }).default(spec.defaultDir ?? "asc"),
    ...((spec.filters ?? {}) as F),
  });
}

/** Builds the answer body from the parsed query, so page and pageSize echo what was used. */
export function listPage<Row>(input: { page: number; pageSize: number }, data: Row[], total: number): ListPage<Row> {
  return { data, page: input.page, pageSize: input.pageSize, total };
}
