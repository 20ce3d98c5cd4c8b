import { describe, expect, it } from "vitest";
import { FileTooLargeError } from "@/lib/files/errors";
import { checkSdsBytes, inlineDisposition, looksLikePdf, MAX_FILE_NAME_LENGTH, MAX_SDS_BYTES, sanitiseFileName } from "@/lib/files/validate";

const bytes = (text: string) => new TextEncoder().encode(text);

describe("looksLikePdf", () => {
  it("accepts bytes that start with the %PDF- header", () => {
    expect(looksLikePdf(bytes("%PDF-1.7\n%âãÏÓ\n1 0 obj"))).toBe(true);
    expect(looksLikePdf(bytes("%PDF-2.0"))).toBe(true);
  });

  it("refuses a Windows executable, HTML, an empty file and a header that is only close", () => {
    expect(looksLikePdf(new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00]))).toBe(false); // "MZ"
    expect(looksLikePdf(bytes("<!DOCTYPE html><html>%PDF-1.4"))).toBe(false);
    expect(looksLikePdf(new Uint8Array())).toBe(false);
    expect(looksLikePdf(bytes("%PDF"))).toBe(false);
    expect(looksLikePdf(bytes("%pdf-1.4"))).toBe(false);
    expect(looksLikePdf(bytes(" %PDF-1.4"))).toBe(false);
  });
});

describe("checkSdsBytes", () => {
  it("passes a PDF at exactly the limit", () => {
    const atLimit = new Uint8Array(MAX_SDS_BYTES);
    atLimit.set(bytes("%PDF-1.4"));
    expect(() => checkSdsBytes(atLimit)).not.toThrow();
  });

  it("refuses one byte over 20 MB with a 413", () => {
    expect(MAX_SDS_BYTES).toBe(20 * 1024 * 1024);
    const over = new Uint8Array(MAX_SDS_BYTES + 1);
    over.set(bytes("%PDF-1.4"));
    expect(() => checkSdsBytes(over)).toThrow(FileTooLargeError);
    try {
      checkSdsBytes(over);
    } catch (error) {
      expect((error as FileTooLargeError).status).toBe(413);
    }
  });

  it("refuses an empty file and a non-PDF with a 400 and a message for the file field", () => {
    expect(() => checkSdsBytes(new Uint8Array())).toThrow("The file is empty.");
    expect(() => checkSdsBytes(bytes("MZ\x90\x00"))).toThrow("This file is not a PDF.");
  });
});

describe("sanitiseFileName", () => {
  it("keeps an ordinary name as it is", () => {
    expect(sanitiseFileName("Acetone SDS (Sigma) 2025.pdf")).toBe("Acetone SDS (Sigma) 2025.pdf");
    expect(sanitiseFileName("Éthanol – fiche de données.pdf")).toBe("Éthanol – fiche de données.pdf");
  });

  it("drops any directory part, Unix or Windows", () => {
    expect(sanitiseFileName("../../etc/passwd.pdf")).toBe("passwd.pdf");
    expect(sanitiseFileName("C:\\Users\\me\\Desktop\\acetone.pdf")).toBe("acetone.pdf");
  });

  it("removes control and bidi-override characters and collapses whitespace", () => {
    expect(sanitiseFileName("ace\u0000tone\r\n.pdf")).toBe("acetone.pdf");
    expect(sanitiseFileName("invoice\u202Efdp.exe")).toBe("invoicefdp.exe");
    expect(sanitiseFileName("  two \u00a0 spaces.pdf  ")).toBe("two spaces.pdf");
    expect(sanitiseFileName("tab\there.pdf")).toBe("tabhere.pdf");
  });

  it("strips leading dots and falls back to a plain name when nothing is left", () => {
    expect(sanitiseFileName(".hidden.pdf")).toBe("hidden.pdf");
    expect(sanitiseFileName("")).toBe("safety-data-sheet.pdf");
    expect(sanitiseFileName("../")).toBe("safety-data-sheet.pdf");
    expect(sanitiseFileName(null)).toBe("safety-data-sheet.pdf");
  });

  it("shortens a long name to 200 characters and keeps the extension", () => {
    const long = `${"a".repeat(300)}.pdf`;
    const name = sanitiseFileName(long);
    expect(name).toHaveLength(MAX_FILE_NAME_LENGTH);
    expect(name.endsWith(".pdf")).toBe(true);
  });

  it("never splits a character made of two UTF-16 units", () => {
    const name = sanitiseFileName(`${"🧪".repeat(150)}.pdf`);
    expect(name.length).toBeLessThanOrEqual(MAX_FILE_NAME_LENGTH);
    expect(name).toBe(`${"🧪".repeat(98)}.pdf`);
  });
});

describe("inlineDisposition", () => {
  it("gives an ASCII fallback and the exact name RFC 5987-encoded", () => {
    expect(inlineDisposition("acetone.pdf")).toBe(`inline; filename="acetone.pdf"; filename*=UTF-8''acetone.pdf`);
    expect(inlineDisposition(`Éthanol "95%" (it's).pdf`)).toBe(
      `inline; filename="_thanol _95__ (it's).pdf"; filename*=UTF-8''%C3%89thanol%20%2295%25%22%20%28it%27s%29.pdf`,
    );
  });
});
