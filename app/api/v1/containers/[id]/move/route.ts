import { NextResponse } from "next/server";
import { getContainer } from "@/db/queries/containers";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { containerMoveSchema } from "@/lib/inventory/schemas";
import { moveContainer } from "@/lib/inventory/service";

/** Moves a container to another storage unit; the move is kept in its history. */
export const POST = route({ action: "containers.write", schema: containerMoveSchema }, ({ params, user, scope, input }) => {
  const id = requireId(params, "That container");
  moveContainer(user, scope, id, input.storageUnitId);
  return NextResponse.json({ data: getContainer(id) });
});
