import "server-only";
import { createRequire } from "node:module";
import path from "node:path";
import zlib from "node:zlib";

/**
 * The workbook's zip entries carry a CRC-32 of their bytes, computed by archiver's crc32-stream
 * with the `crc-32` package in JavaScript: for the register of 100,000 findings (some 330 MB of
 * sheet XML) that is a third of a second of the thread that also builds the rows. Node has the
 * same checksum natively (zlib.crc32, from zlib: Node ≥ 20.15), about ten times faster.
 *
 * `installNativeZipCrc()` gives the `crc-32` module that crc32-stream loads (found along exceljs's own
 * dependency chain, so it is the very instance in use) a `buf` that calls zlib.crc32, keeping its
 * contract: `buf(data, seed)` continues a checksum from `seed` (anything that is not a number
 * counts as 0, as in crc-32) and returns it as a signed 32-bit integer. Where Node lacks
 * zlib.crc32, or the chain cannot be followed (another exceljs layout), nothing changes: the
 * JavaScript checksum is the same number, only slower. tests/unit/exports/zip-crc.test.ts checks
 * the check value and the chaining.
 */

type Crc32Module = { buf: (data: Uint8Array, seed?: unknown) => number; nativeFromZlib?: boolean };

const CHAIN = ["exceljs", "archiver", "zip-stream", "compress-commons", "crc32-stream", "crc-32"];

function crcModuleInUse(): Crc32Module | null {
  try {
    let from = path.join(process.cwd(), "package.json");
    let resolved = "";
    for (const name of CHAIN) {
      resolved = createRequire(from).resolve(name);
      from = resolved;
    }
    return createRequire(path.join(process.cwd(), "package.json"))(resolved) as Crc32Module;
  } catch {
    return null;
  }
}

/** The outcome of the first call: the module chain is followed once per process. */
let installed: boolean | null = null;

/** Native CRC-32 for archiver's zip entries; true when in use. Idempotent. */
export function installNativeZipCrc(): boolean {
  if (installed !== null) return installed;
  const crc32 = (zlib as unknown as { crc32?: (data: Uint8Array, value?: number) => number }).crc32;
  const crcModule = typeof crc32 === "function" ? crcModuleInUse() : null;
  installed = false;
  if (crc32 && crcModule && typeof crcModule.buf === "function") {
    if (!crcModule.nativeFromZlib) {
      crcModule.buf = (data, seed) => crc32(data, typeof seed === "number" ? seed >>> 0 : 0) | 0;
      crcModule.nativeFromZlib = true;
    }
    installed = true;
  }
  return installed;
}
