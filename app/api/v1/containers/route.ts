import { NextResponse } from "next/server";
import { listContainers } from "@/db/queries/container-list";
import { getContainer } from "@/db/queries/containers";
import { worstOpenSeverityByContainer } from "@/db/queries/location-findings";
import { scopeFor } from "@/lib/auth/permissions";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { containerCreateSchema, containerListQuerySchema } from "@/lib/inventory/schemas";
import { createContainer } from "@/lib/inventory/service";

/** Logs a container. A researcher is always its owner. */
export const POST = route({ action: "containers.write", schema: containerCreateSchema }, ({ user, scope, input }) =>
  NextResponse.json({ data: getContainer(createContainer(user, scope, input).id) }, { status: 201 }),
);

/**
 * Containers, paged, sorted and filtered on the server. `openFindingSeverity`: the worst open
 * finding the container contributes to that the reader may see (for their own containers, every
 * one), or null.
 */
export const GET = route({ action: "inventory.read", schema: containerListQuerySchema }, ({ user, input }) => {
  const { rows, total } = listContainers(input, user.id);
  const worst = worstOpenSeverityByContainer(user, scopeFor(user.role, "findings.read"), rows.map((row) => row.id));
  return NextResponse.json(listPage(input, rows.map((row) => ({ ...row, openFindingSeverity: worst.get(row.id) ?? null })), total));
});
