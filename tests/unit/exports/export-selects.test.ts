/**
 * The workbook's page queries read rows as arrays and name the fields with a literal mapping
 * (db/queries/register-export.ts): each mapping must take field i from select expression i.
 */
import { describe, expect, it } from "vitest";
import { EXPORT_SELECTS } from "@/db/queries/register-export";

/** The select list's expressions, split at the commas outside parentheses. */
function expressions(select: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let current = "";
  for (const ch of select) {
    if (ch === "(") depth += 1;
    if (ch === ")") depth -= 1;
    if (ch === "," && depth === 0) {
      parts.push(current.trim());
      current = "";
    } else current += ch;
  }
  parts.push(current.trim());
  return parts;
}

describe("export page queries", () => {
  it.each(EXPORT_SELECTS.map((s, i) => [i, s] as const))("select list %i and its row mapping line up", (_, { select, toRow }) => {
    const exprs = expressions(select);
    const positions = exprs.map((_e, i) => i);
    const row = toRow(positions) as Record<string, unknown>;
    // Every expression is mapped exactly once, in order.
    expect(Object.values(row)).toEqual(positions);
  });

  it("maps the findings' columns by name", () => {
    const [findingSelect] = EXPORT_SELECTS;
    const exprs = expressions(findingSelect.select);
    const row = findingSelect.toRow(exprs) as Record<string, unknown>;
    expect(row.id).toBe("f.id");
    expect(row.title).toBe("f.title");
    expect(row.siteName).toBe("s.name");
    expect(row.unitCode).toBe("u.code");
    expect(row.limitValue).toBe("f.limit_value");
    expect(row.worstCaseTempC).toBe("f.worst_case_temp_c");
    expect(row.worstCaseSource).toBe("f.worst_case_source");
    expect(String(row.lastEvaluatedAt)).toContain("r.assessed_at");
    expect(row.assigneeName).toBe("a.name");
    expect(row.fingerprint).toBe("f.fingerprint");
  });

  it("maps the containers' columns by name", () => {
    const containerSelect = EXPORT_SELECTS[2];
    const row = containerSelect.toRow(expressions(containerSelect.select)) as Record<string, unknown>;
    expect(row).toMatchObject({ label: "c.label", substanceName: "sub.name", mixtureName: "m.name", amountUnit: "c.amount_unit", siteName: "s.name", roomCode: "r.code", unitCode: "u.code", ownerName: "o.name", notes: "c.notes" });
  });
});
