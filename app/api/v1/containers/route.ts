import { NextResponse } from "next/server";
import { listContainers } from "@/db/queries/container-list";
import { getContainer } from "@/db/queries/containers";
import { listPage } from "@/lib/http/list-query";
import { route } from "@/lib/http/route";
import { containerCreateSchema, containerListQuerySchema } from "@/lib/inventory/schemas";
import { createContainer } from "@/lib/inventory/service";

/** Logs a container. A researcher is always its owner. */
export const POST = route({ action: "containers.write", schema: containerCreateSchema }, ({ user, scope, input }) =>
  NextResponse.json({ data: getContainer(createContainer(user, scope, input).id) }, { status: 201 }),
);

/** Containers, paged, sorted and filtered on the server. */
export const GET = route({ action: "inventory.read", schema: containerListQuerySchema }, ({ user, input }) => {
  const { rows, total } = listContainers(input, user.id);
  return NextResponse.json(listPage(input, rows, total));
});
