import { NextResponse } from "next/server";
import { getContainer } from "@/db/queries/containers";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { containerStateSchema } from "@/lib/inventory/schemas";
import { setContainerState } from "@/lib/inventory/service";

/** Marks a container sealed, opened, in use, empty or disposed of. */
export const POST = route({ action: "containers.write", schema: containerStateSchema }, ({ params, user, scope, input }) => {
  const id = requireId(params, "That container");
  setContainerState(user, scope, id, input.state);
  return NextResponse.json({ data: getContainer(id) });
});
