import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { streamMultipartFile, UploadTooLargeError } from "@/lib/files/multipart-stream";
import { ValidationError } from "@/lib/errors";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-multipart-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let n = 0;
const dest = () => path.join(dir, `out-${++n}.csv`);

/** The form as the platform encodes it, re-sent in chunks of `size` bytes. */
async function chunkedRequest(form: FormData, size: number): Promise<Request> {
  const encoded = new Request("http://localhost/", { method: "POST", body: form });
  const bytes = new Uint8Array(await encoded.arrayBuffer());
  let at = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (at >= bytes.length) return controller.close();
      controller.enqueue(bytes.slice(at, at + size));
      at += size;
    },
  });
  return new Request("http://localhost/", { method: "POST", headers: { "content-type": encoded.headers.get("content-type")! }, body, duplex: "half" } as RequestInit);
}

const options = (destPath: string, maxBytes = 1024 * 1024) => ({ field: "file", maxBytes, destPath, tooLargeHint: "split it.", missingMessage: "Choose a file." });

describe("streaming a multipart file part to disk", () => {
  // Text that looks like a boundary but is not one, CRLFs, and bytes that are not UTF-8.
  const content = new Uint8Array([...new TextEncoder().encode("a,b\r\n--not-the-boundary\r\n\r\n1,2\r\n"), 0xb0, 0x43, 0x0d, 0x0a]);

  it("writes exactly the file's bytes whatever the chunk size, past other fields", async () => {
    for (const size of [1, 2, 7, 64, 100_000]) {
      const form = new FormData();
      form.set("note", "before the file");
      form.set("file", new File([content], "logger.csv", { type: "text/csv" }));
      form.set("after", "x");
      const out = dest();
      const result = await streamMultipartFile(await chunkedRequest(form, size), options(out));
      expect(result.fileName).toBe("logger.csv");
      expect(result.sizeBytes).toBe(content.length);
      expect(new Uint8Array(fs.readFileSync(out))).toEqual(content);
      expect(result.firstBytes).toEqual(content);
    }
  });

  it("refuses a body without the file field, and one that is not multipart", async () => {
    const form = new FormData();
    form.set("other", new File([content], "x.csv"));
    await expect(streamMultipartFile(await chunkedRequest(form, 10), options(dest()))).rejects.toThrow(ValidationError);
    await expect(streamMultipartFile(new Request("http://localhost/", { method: "POST", body: "{}", headers: { "content-type": "application/json" } }), options(dest()))).rejects.toThrow("Choose a file.");
  });

  it("stops at the limit (413) and leaves no file behind", async () => {
    const form = new FormData();
    form.set("file", new File([new Uint8Array(5000).fill(65)], "big.csv"));
    const out = dest();
    await expect(streamMultipartFile(await chunkedRequest(form, 512), options(out, 4096))).rejects.toThrow(UploadTooLargeError);
    expect(fs.existsSync(out)).toBe(false);
  });
});
