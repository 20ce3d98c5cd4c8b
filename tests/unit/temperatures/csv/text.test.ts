import { describe, expect, it } from "vitest";
import { detectEncoding } from "@/lib/temperatures/csv/text";

const bytes = (...values: number[]) => new Uint8Array(values);
const text = (s: string) => new TextEncoder().encode(s);

describe("the encoding of a logger file", () => {
  it("reads UTF-8 with or without a byte-order mark, and UTF-16 with one", () => {
    expect(detectEncoding(text("Temp;°C\n"), "a.csv")).toEqual({ ok: true, encoding: "utf-8" });
    expect(detectEncoding(bytes(0xef, 0xbb, 0xbf, 0x41), "a.csv")).toEqual({ ok: true, encoding: "utf-8" });
    expect(detectEncoding(bytes(0xff, 0xfe, 0x41, 0x00), "a.csv")).toEqual({ ok: true, encoding: "utf-16le" });
  });

  it("reads a file that is not UTF-8 as Windows-1252, where 0xB0 is the degree sign", () => {
    const latin = bytes(...text("Temp;"), 0xb0, 0x43, 0x0a);
    expect(detectEncoding(latin, "a.csv")).toEqual({ ok: true, encoding: "windows-1252" });
    expect(new TextDecoder("windows-1252").decode(latin)).toBe("Temp;°C\n");
  });

  it("keeps a multi-byte character cut at the end of the sample as UTF-8", () => {
    const degree = text("°"); // C2 B0
    expect(detectEncoding(bytes(...text("Temp;"), degree[0]), "a.csv")).toEqual({ ok: true, encoding: "utf-8" });
  });

  it("names workbooks, PDFs and binaries", () => {
    expect(detectEncoding(bytes(0x50, 0x4b, 0x03, 0x04), "x.xlsx")).toMatchObject({ ok: false, message: expect.stringMatching(/workbook \(XLSX\)/) });
    expect(detectEncoding(text("%PDF-1.7"), "x.pdf")).toMatchObject({ ok: false, message: expect.stringMatching(/is a PDF/) });
    expect(detectEncoding(bytes(0x41, 0x00, 0x42), "x.bin")).toMatchObject({ ok: false, message: expect.stringMatching(/not a text file/) });
    expect(detectEncoding(bytes(), "x.csv")).toEqual({ ok: false, message: "The file is empty." });
  });
});
