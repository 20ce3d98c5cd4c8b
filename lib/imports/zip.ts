/**
 * The zip archive under an XLSX workbook, opened with limits. An archive is judged twice: first by
 * its central directory (the sizes it declares for every part, before anything is unpacked), then
 * on the bytes actually inflated, because declared sizes can lie. Inflating is done here, not by
 * the zip reader, so that the packed bytes fed in and the bytes coming out are both counted and
 * reading stops at the first byte past a limit.
 */
import zlib from "node:zlib";
import type { Readable } from "node:stream";
import yauzl from "yauzl";
import { XLSX_LIMITS } from "@/lib/limits";
import { ImportFileError } from "./errors";

export type ZipSource = { path: string } | { bytes: Uint8Array };

export type ZipLimits = {
  entryBytes: number;
  totalBytes: number;
  compressionRatio: number;
  ratioFromBytes: number;
  entries: number;
};

const MiB = 1024 * 1024;

function megabytes(bytes: number): string {
  return `${(bytes / MiB).toFixed(1)} MB`;
}

function sizeText(bytes: number): string {
  return bytes >= MiB ? megabytes(bytes) : `${Math.max(1, Math.round(bytes / 1024))} KB`;
}

export function unreadableWorkbook(): ImportFileError {
  return new ImportFileError(
    "unreadable_file",
    "The file looks like a ZIP archive but is not a readable Excel workbook. Save it again as .xlsx or as CSV.",
  );
}

/** A limit as people read it: "100 MB", not "100.0 MB". */
function limitText(bytes: number): string {
  return megabytes(bytes).replace(".0 ", " ");
}

/** `bytes` null: the part was stopped while inflating, at the limit. */
function entryTooLarge(name: string, bytes: number | null, limitBytes: number): ImportFileError {
  return new ImportFileError(
    "entry_too_large",
    `The workbook's part ${name} unpacks to ${bytes === null ? `more than ${limitText(limitBytes)}` : megabytes(bytes)}; ` +
      `an import workbook may hold at most ${limitText(limitBytes)} in one part. Split the data into smaller files.`,
  );
}

function totalTooLarge(limitBytes: number): ImportFileError {
  return new ImportFileError(
    "entry_too_large",
    `The workbook unpacks to more than ${limitText(limitBytes)} in all; an import workbook may hold at most ` +
      `${limitText(limitBytes)}. Split the data into smaller files.`,
  );
}

function tooTightlyPacked(name: string, unpacked: number, packed: number, limits: ZipLimits): ImportFileError {
  const ratio = Math.floor(unpacked / Math.max(1, packed));
  return new ImportFileError(
    "zip_bomb",
    `The workbook's part ${name} unpacks to ${ratio.toLocaleString("en")} times its packed size ` +
      `(${sizeText(unpacked)} from ${sizeText(packed)}). Spreadsheet data packs to at most about ` +
      `${limits.compressionRatio} times smaller, so the file is refused as a decompression bomb. ` +
      "Save the data again from a spreadsheet program, or as CSV.",
  );
}

/** The parts of an archive by name, read from its central directory once every limit was checked. */
export class BoundedZip {
  /** Bytes inflated so far from all parts, against `limits.totalBytes`. */
  private inflatedTotal = 0;

  private constructor(
    private readonly zip: yauzl.ZipFile,
    readonly entries: ReadonlyMap<string, yauzl.Entry>,
    private readonly limits: ZipLimits,
  ) {}

  /**
   * Opens the archive and checks its central directory: the number of parts, each part's unpacked
   * size and its packing ratio, and the unpacked total. Throws ImportFileError.
   */
  static async open(source: ZipSource, limits: ZipLimits = XLSX_LIMITS): Promise<BoundedZip> {
    let zip: yauzl.ZipFile;
    const options: yauzl.Options = { lazyEntries: true, autoClose: false, decodeStrings: true, validateEntrySizes: true, strictFileNames: false };
    try {
      zip =
        "path" in source
          ? await yauzl.openPromise(source.path, options)
          : await yauzl.fromBufferPromise(Buffer.from(source.bytes.buffer, source.bytes.byteOffset, source.bytes.byteLength), options);
    } catch {
      throw unreadableWorkbook();
    }
    try {
      if (zip.entryCount > limits.entries) {
        throw new ImportFileError(
          "zip_bomb",
          `The workbook is made of ${zip.entryCount.toLocaleString("en")} parts; a workbook has at most a few hundred, ` +
            `and imports read workbooks of up to ${limits.entries.toLocaleString("en")} parts. Save the data again as .xlsx or as CSV.`,
        );
      }
      const entries = new Map<string, yauzl.Entry>();
      let declaredTotal = 0;
      try {
        for await (const entry of zip.eachEntry()) {
          const name = entry.fileName;
          if (entry.uncompressedSize > limits.entryBytes) throw entryTooLarge(name, entry.uncompressedSize, limits.entryBytes);
          if (entry.uncompressedSize > limits.ratioFromBytes && entry.uncompressedSize > limits.compressionRatio * entry.compressedSize) {
            throw tooTightlyPacked(name, entry.uncompressedSize, entry.compressedSize, limits);
          }
          declaredTotal += entry.uncompressedSize;
          if (declaredTotal > limits.totalBytes) throw totalTooLarge(limits.totalBytes);
          if (!entries.has(name)) entries.set(name, entry);
        }
      } catch (error) {
        if (error instanceof ImportFileError) throw error;
        throw unreadableWorkbook();
      }
      return new BoundedZip(zip, entries, limits);
    } catch (error) {
      zip.close();
      throw error;
    }
  }

  close(): void {
    if (this.zip.isOpen) this.zip.close();
  }

  /**
   * The part's bytes, inflated here and counted: refused at the first byte past the part's limit
   * (`maxBytes`, at most the per-part limit), past the total of all parts, or past the packing
   * ratio once the part passes `ratioFromBytes` — whatever the archive declared.
   */
  async *read(entry: yauzl.Entry, maxBytes: number = this.limits.entryBytes): AsyncGenerator<Buffer> {
    const limit = Math.min(maxBytes, this.limits.entryBytes);
    if (entry.uncompressedSize > limit) throw entryTooLarge(entry.fileName, entry.uncompressedSize, limit);
    if (entry.isEncrypted()) {
      throw new ImportFileError("unreadable_file", "The workbook is protected with a password. Save it again without one, or as CSV.");
    }
    if (entry.compressionMethod !== 0 && entry.compressionMethod !== 8) throw unreadableWorkbook();
    let raw: Readable;
    try {
      raw = await this.zip.openReadStreamPromise(entry, { decodeFileData: false });
    } catch {
      throw unreadableWorkbook();
    }
    // Packed bytes handed to the inflater (stored parts are not packed: the ratio is 1).
    let packed = 0;
    let output: Readable = raw;
    let inflate: zlib.InflateRaw | null = null;
    if (entry.compressionMethod === 8) {
      raw.on("data", (chunk: Buffer) => {
        packed += chunk.length;
      });
      inflate = zlib.createInflateRaw();
      raw.on("error", (error) => inflate!.destroy(error));
      output = raw.pipe(inflate);
    }
    let unpacked = 0;
    try {
      for await (const chunk of output as AsyncIterable<Buffer>) {
        unpacked += chunk.length;
        if (!inflate) packed = unpacked;
        this.inflatedTotal += chunk.length;
        if (unpacked > limit) throw entryTooLarge(entry.fileName, null, limit);
        if (this.inflatedTotal > this.limits.totalBytes) throw totalTooLarge(this.limits.totalBytes);
        if (unpacked > this.limits.ratioFromBytes && unpacked > this.limits.compressionRatio * packed) {
          throw tooTightlyPacked(entry.fileName, unpacked, packed, this.limits);
        }
        yield chunk;
      }
    } catch (error) {
      if (error instanceof ImportFileError) throw error;
      throw unreadableWorkbook();
    } finally {
      if (inflate) {
        raw.unpipe(inflate);
        inflate.destroy();
      }
      raw.destroy();
    }
  }
}
