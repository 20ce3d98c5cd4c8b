/**
 * The native CRC-32 given to archiver's crc-32 module (lib/exports/zip-crc.ts) must be the same
 * checksum with the same contract. Check value: CRC-32 (ISO-HDLC, the zip and PNG checksum) of the
 * ASCII "123456789" is 0xCBF43926 (the standard check value of the CRC catalogue,
 * reveng.sourceforge.io/crc-catalogue, "CRC-32/ISO-HDLC").
 */
import { createRequire } from "node:module";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { installNativeZipCrc } from "@/lib/exports/zip-crc";

type Crc32Module = { buf: (data: Uint8Array, seed?: unknown) => number };

function crcModule(): Crc32Module {
  let from = path.join(process.cwd(), "package.json");
  for (const name of ["exceljs", "archiver", "zip-stream", "compress-commons", "crc32-stream", "crc-32"]) from = createRequire(from).resolve(name);
  return createRequire(path.join(process.cwd(), "package.json"))(from) as Crc32Module;
}

/** The reflected CRC-32 bit by bit (polynomial 0xEDB88320), as a signed 32-bit integer like crc-32's. */
function referenceCrc(data: Uint8Array): number {
  let crc = 0xffffffff;
  for (const byte of data) {
    crc ^= byte;
    for (let bit = 0; bit < 8; bit++) crc = crc & 1 ? (crc >>> 1) ^ 0xedb88320 : crc >>> 1;
  }
  return ~crc | 0;
}

describe("native CRC-32 for the zip entries", () => {
  const crc = crcModule();
  const data = Buffer.from(Array.from({ length: 100_000 }, (_, i) => (i * 7919) % 251));

  it("is the same checksum, chained the same way", () => {
    const whole = referenceCrc(data);
    expect(referenceCrc(Buffer.from("123456789")) >>> 0).toBe(0xcbf43926);
    expect(crc.buf(data)).toBe(whole); // the JavaScript one, or already the native one
    expect(installNativeZipCrc()).toBe(true);
    expect((crc as { nativeFromZlib?: boolean }).nativeFromZlib).toBe(true);
    expect(crc.buf(Buffer.from("123456789")) >>> 0).toBe(0xcbf43926);
    expect(crc.buf(data)).toBe(whole);
    // crc32-stream starts from a 4-byte zero Buffer as the seed, then passes the unsigned result.
    const first = crc.buf(data.subarray(0, 40_000), Buffer.alloc(4)) >>> 0;
    expect(crc.buf(data.subarray(40_000), first)).toBe(whole);
    expect(crc.buf(data.subarray(40_000), first | 0)).toBe(whole);
    expect(installNativeZipCrc()).toBe(true);
  });
});
