import { NotFoundError } from "@/lib/errors";
import { errorResponse, withSecurityHeaders } from "@/lib/http/route";

/** Any path under /api/v1 that no route serves answers in the one JSON error shape. */
function notFound(): Response {
  return withSecurityHeaders(errorResponse(new NotFoundError("That API route")));
}

export const GET = notFound;
export const POST = notFound;
export const PUT = notFound;
export const PATCH = notFound;
export const DELETE = notFound;
