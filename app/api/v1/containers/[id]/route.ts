import { NextResponse } from "next/server";
import { getContainer } from "@/db/queries/containers";
import { NotFoundError } from "@/lib/errors";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { containerUpdateSchema } from "@/lib/inventory/schemas";
import { updateContainer } from "@/lib/inventory/service";

export const GET = route({ action: "inventory.read" }, ({ params }) => {
  const container = getContainer(requireId(params, "That container"));
  if (!container) throw new NotFoundError("That container");
  return NextResponse.json({ data: container });
});

/** Edits a container. Researchers may change only their own (403 otherwise, nothing changes). */
export const PATCH = route({ action: "containers.write", schema: containerUpdateSchema }, ({ params, user, scope, input }) => {
  const id = requireId(params, "That container");
  updateContainer(user, scope, id, input);
  return NextResponse.json({ data: getContainer(id) });
});
