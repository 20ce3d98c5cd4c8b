/**
 * Text for spreadsheet cells, so that nothing a user typed runs as a formula. Pure.
 *
 * How it is done, and why not with an apostrophe:
 * - exceljs writes a JavaScript string as a string cell; only a `{ formula }` value becomes a
 *   formula. A label "=HYPERLINK(…)" is therefore shown, not run, when the workbook opens.
 * - Editing such a cell (F2, then Enter) makes a spreadsheet program parse the text again and
 *   turn it into a formula — unless the cell has the Text number format "@": text entered into a
 *   Text cell stays text. The workbook writer gives every string cell that format.
 * - A leading apostrophe is what protects a CSV file, where the program guesses each cell's type.
 *   In an xlsx file the apostrophe would be an ordinary character of the value (the "quote
 *   prefix" of spreadsheet programs is a cell style flag, which exceljs does not write), so an
 *   auditor would see and compare "'-20 °C rack" instead of the label "-20 °C rack". The value is
 *   kept exactly as stored instead.
 */

/** Excel's limit for the characters in one cell; longer text makes it "repair" the file. */
export const MAX_CELL_CHARS = 32_767;

/** The Text number format, applied to every string cell. */
export const TEXT_NUM_FMT = "@";

const TRUNCATION_MARK = " … [cut at the cell limit]";

/**
 * Text a spreadsheet program would read as a formula, a DDE call or a macro if it were typed in:
 * it starts with "=", "+", "-", "@", a tab or a carriage return.
 */
export function isFormulaLike(text: string): boolean {
  return /^[=+\-@\t\r]/.test(text);
}

/**
 * A user-supplied value as the string of a text cell, or null for no value. The string itself is
 * not altered (see above), except that text over the cell limit is cut with a visible mark.
 */
export function safeText(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  const text = typeof value === "string" ? value : String(value);
  if (text === "") return null;
  if (text.length <= MAX_CELL_CHARS) return text;
  return text.slice(0, MAX_CELL_CHARS - TRUNCATION_MARK.length) + TRUNCATION_MARK;
}

/** Characters XML 1.0 cannot hold (C0 controls other than tab, line feed and carriage return, U+FFFE, U+FFFF) and unpaired surrogates. */
export const XML_INVALID = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/**
 * Text that an XML document holds as it is: characters XML cannot hold dropped, and line ends as
 * line feeds (an XML parser turns a carriage return into a line feed anyway). For text Headroom
 * renders itself (calculation traces); a value as typed is kept as it is (see safeText).
 */
export function xmlSafeText(text: string): string {
  return text.replace(XML_INVALID, "").replace(/\r\n?/g, "\n");
}
