/**
 * Compares a real answer or payload with its documented zod schema by keys, all the way down, for
 * the tests that keep the API document honest.
 */
import { z } from "zod";

/**
 * Where the answer and the schema part ways: an object's keys differ from the schema's (loose
 * objects, documented in words only, are not compared), or a value does not parse.
 */
export function keyProblems(schema: z.ZodType, value: unknown, at = "$"): string[] {
  if (schema instanceof z.ZodOptional || schema instanceof z.ZodNullable || schema instanceof z.ZodDefault) {
    return value === null || value === undefined ? [] : keyProblems(schema.unwrap() as z.ZodType, value, at);
  }
  if (schema instanceof z.ZodArray) return (value as unknown[]).flatMap((item, i) => keyProblems(schema.element as z.ZodType, item, `${at}[${i}]`));
  if (schema instanceof z.ZodObject) {
    const shape = schema.shape as Record<string, z.ZodType>;
    const problems: string[] = [];
    const loose = (schema.def as { catchall?: z.ZodType }).catchall instanceof z.ZodUnknown;
    if (!loose) {
      const expected = Object.keys(shape).filter((k) => !(shape[k] instanceof z.ZodOptional)).sort();
      const actual = Object.keys(value as object).filter((k) => (value as Record<string, unknown>)[k] !== undefined);
      const missing = expected.filter((k) => !actual.includes(k));
      const extra = actual.filter((k) => !(k in shape));
      if (missing.length || extra.length) problems.push(`${at}: missing ${missing.join(", ") || "none"}; undocumented ${extra.join(", ") || "none"}`);
    }
    for (const [key, child] of Object.entries(shape)) if (key in (value as object)) problems.push(...keyProblems(child, (value as Record<string, unknown>)[key], `${at}.${key}`));
    return problems;
  }
  return [];
}
