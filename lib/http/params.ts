import { NotFoundError } from "@/lib/errors";
import { idParam } from "./paging";

/** The numeric id from a route's [id] segment, or a 404 naming what was looked for. */
export function requireId(params: Record<string, string>, what: string): number {
  const id = idParam(params.id);
  if (!id) throw new NotFoundError(what);
  return id;
}
