import { NextResponse } from "next/server";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { seriesQuerySchema } from "@/lib/temperatures/schemas";
import { readingSeries } from "@/lib/temperatures/series";

/**
 * A sensor's trace for a chart: `from` and `to` as ISO-8601 with an offset (default: the year up
 * to its latest reading). Every reading when there are at most 1,500, otherwise time buckets with
 * their mean, lowest and highest reading; with the location's set range, threshold and the
 * excursions overlapping the window.
 */
export const GET = route({ action: "temperatures.read", schema: seriesQuerySchema }, ({ params, input }) =>
  NextResponse.json({ data: readingSeries(requireId(params, "That sensor"), { fromMs: input.from, toMs: input.to }) }),
);
