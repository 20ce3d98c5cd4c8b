/**
 * The text encoding of a logger file, from its first bytes. Pure.
 *
 * UTF-8 (with or without a byte-order mark) and UTF-16 with a byte-order mark are read as such.
 * A file that is not valid UTF-8 is read as Windows-1252: loggers and spreadsheet programs on
 * Windows write the degree sign as the single byte 0xB0, and refusing such files would refuse most
 * of them. Workbooks, PDFs and other binaries are named and refused.
 */
export type TextEncoding = "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";

export type EncodingResult = { ok: true; encoding: TextEncoding } | { ok: false; message: string };

const startsWith = (bytes: Uint8Array, magic: number[]) => magic.every((b, i) => bytes[i] === b);

export function detectEncoding(sample: Uint8Array, fileName: string): EncodingResult {
  if (sample.length === 0) return { ok: false, message: "The file is empty." };
  if (startsWith(sample, [0xef, 0xbb, 0xbf])) return { ok: true, encoding: "utf-8" };
  if (startsWith(sample, [0xff, 0xfe])) return { ok: true, encoding: "utf-16le" };
  if (startsWith(sample, [0xfe, 0xff])) return { ok: true, encoding: "utf-16be" };
  if (startsWith(sample, [0x50, 0x4b, 0x03, 0x04])) {
    return { ok: false, message: `${fileName} is a workbook (XLSX), not a CSV file. Save the sheet as CSV and upload that.` };
  }
  if (startsWith(sample, [0xd0, 0xcf, 0x11, 0xe0])) return { ok: false, message: `${fileName} is an old-style .xls workbook. Save the sheet as CSV and upload that.` };
  if (startsWith(sample, [0x25, 0x50, 0x44, 0x46])) return { ok: false, message: `${fileName} is a PDF. Export the logger's readings as CSV and upload that.` };
  if (sample.includes(0)) return { ok: false, message: `${fileName} is not a text file. Export the logger's readings as CSV (text) and upload that.` };
  try {
    // stream: true lets a character cut at the end of the sample pass.
    new TextDecoder("utf-8", { fatal: true }).decode(sample, { stream: true });
    return { ok: true, encoding: "utf-8" };
  } catch {
    return { ok: true, encoding: "windows-1252" };
  }
}

export const ENCODING_LABELS: Record<TextEncoding, string> = {
  "utf-8": "UTF-8",
  "utf-16le": "UTF-16 (little-endian)",
  "utf-16be": "UTF-16 (big-endian)",
  "windows-1252": "Windows-1252 (Western European)",
};
