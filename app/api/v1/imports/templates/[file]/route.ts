import { containerTemplateCsv, locationTemplateCsv, templateFileSchema, writeTemplateXlsx, type TemplateKind } from "@/lib/imports";
import { route } from "@/lib/http/route";
import { NotFoundError } from "@/lib/errors";

const CONTENT_TYPES = {
  csv: "text/csv; charset=utf-8",
  xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
} as const;

/** The import templates, /api/v1/imports/templates/{containers|locations}.{csv|xlsx}; any signed-in role may download them. */
export const GET = route({ action: "overview.read" }, async ({ params }) => {
  const file = templateFileSchema.safeParse(params.file ?? "");
  if (!file.success) throw new NotFoundError("That template");
  const [kind, format] = file.data.split(".") as [TemplateKind, keyof typeof CONTENT_TYPES];
  const body =
    format === "xlsx"
      ? new Uint8Array(await writeTemplateXlsx(kind))
      : kind === "containers"
        ? containerTemplateCsv()
        : locationTemplateCsv();
  return new Response(body, {
    headers: {
      "content-type": CONTENT_TYPES[format],
      "content-disposition": `attachment; filename="headroom-${kind}-template.${format}"`,
      "cache-control": "no-store",
    },
  });
});
