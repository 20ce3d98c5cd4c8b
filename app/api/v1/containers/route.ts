import { NextResponse } from "next/server";
import { getContainer } from "@/db/queries/containers";
import { route } from "@/lib/http/route";
import { containerCreateSchema } from "@/lib/inventory/schemas";
import { createContainer } from "@/lib/inventory/service";

/** Logs a container. A researcher is always its owner. */
export const POST = route({ action: "containers.write", schema: containerCreateSchema }, ({ user, scope, input }) =>
  NextResponse.json({ data: getContainer(createContainer(user, scope, input).id) }, { status: 201 }),
);
