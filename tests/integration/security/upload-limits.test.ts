/**
 * Hostile uploads through the real route handlers: workbooks that unpack to hundreds of MB or
 * hold millions of rows, overlong cells, too many columns, and uploads that stream on past their
 * limit without a Content-Length. Each is refused with its code and message, nothing is written,
 * no temporary file is left behind, and the server stops reading at the limit. Good files still
 * preview and import. Data is invented. How fast a bomb is refused, and the memory it costs, are
 * measured by bench/uploads.ts and bench/abuse.ts, not asserted here: a wall-clock bound fails on a
 * busy machine without saying anything about the code.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import ExcelJS from "exceljs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { files, rooms, sites, storageUnits, substances, users, type Role } from "@/db/schema";
import * as locationImportRoute from "@/app/api/v1/imports/locations/route";
import * as locationPreviewRoute from "@/app/api/v1/imports/locations/preview/route";
import * as substanceSdsRoute from "@/app/api/v1/substances/[id]/sds/route";
import { importUploadDir } from "@/lib/imports/service";
import { IMPORT_LIMITS, MULTIPART_OVERHEAD_BYTES, SDS_LIMITS, XLSX_LIMITS } from "@/lib/limits";
import { writeXlsxManyRows, writeXlsxZipBomb } from "../../fixtures/hostile-files";
import { sessionCookieFor } from "../helpers/world";

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

const MiB = 1024 * 1024;
const fixtures = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-hostile-"));
const uploadRoot = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-uploads-"));
process.env.UPLOAD_DIR = uploadRoot;

const cookies = {} as Record<Role, string>;
let acetoneId: number;

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  for (const role of ["facilities", "safety_officer"] as Role[]) {
    cookies[role] = await sessionCookieFor(getDb().select().from(users).where(eq(users.role, role)).get()!);
  }
  acetoneId = getDb().select().from(substances).where(eq(substances.cas, "67-64-1")).get()!.id;
  await writeXlsxZipBomb(path.join(fixtures, "bomb.xlsx"), { cellBytes: 300 * MiB });
  await writeXlsxZipBomb(path.join(fixtures, "bomb-inline-understated.xlsx"), { cellBytes: 300 * MiB, place: "inline", declaredUncompressedBytes: 1000 });
  await writeXlsxZipBomb(path.join(fixtures, "strings-understated.xlsx"), { cellBytes: 30_000, cells: 3000, declaredUncompressedBytes: 1000 });
  await writeXlsxManyRows(path.join(fixtures, "rows.xlsx"), { rows: 3_000_000 });
});

afterAll(() => {
  fs.rmSync(fixtures, { recursive: true, force: true });
  fs.rmSync(uploadRoot, { recursive: true, force: true });
});

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests read arbitrary JSON bodies
type Answer = { status: number; body: any; ms: number };

async function answer(handler: Handler, request: Request, params: Record<string, string> = {}): Promise<Answer> {
  const started = performance.now();
  const response = await handler(request, { params: Promise.resolve(params) });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null, ms: performance.now() - started };
}

/** A multipart upload the way a browser sends it (FormData: the body's length is not in the headers). */
function upload(handler: Handler, fileName: string, content: string | Uint8Array, role: Role = "facilities"): Promise<Answer> {
  const form = new FormData();
  form.append("file", new File([content as BlobPart], fileName));
  return answer(handler, new Request("http://localhost:3999/api/v1/imports/locations", { method: "POST", headers: { cookie: cookies[role] }, body: form }));
}

const CHUNK = 64 * 1024;

/**
 * A multipart body produced on demand, 64 KB per pull and never held whole: the part's header,
 * `head`, then filler bytes up to `fileBytes`. `pulled()` tells how much the server read.
 */
function streamedUpload(options: { url: string; cookie: string; fileName: string; head: Uint8Array; fileBytes: number; filler: number; contentLength?: number }) {
  const boundary = "----headroom-test-boundary";
  const opening = new TextEncoder().encode(
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${options.fileName}"\r\nContent-Type: application/octet-stream\r\n\r\n`,
  );
  const closing = new TextEncoder().encode(`\r\n--${boundary}--\r\n`);
  let sent = 0;
  let fileSent = 0;
  let stage: "opening" | "file" | "closing" | "done" = "opening";
  const body = new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        if (stage === "opening") {
          controller.enqueue(opening);
          sent += opening.length;
          stage = "file";
        } else if (stage === "file") {
          const size = Math.min(CHUNK, options.fileBytes - fileSent);
          const chunk = new Uint8Array(size).fill(options.filler);
          if (fileSent < options.head.length) chunk.set(options.head.subarray(fileSent, fileSent + size));
          controller.enqueue(chunk);
          fileSent += size;
          sent += size;
          if (fileSent >= options.fileBytes) stage = "closing";
        } else if (stage === "closing") {
          controller.enqueue(closing);
          sent += closing.length;
          stage = "done";
        } else controller.close();
      },
    },
    { highWaterMark: 0 },
  );
  const headers: Record<string, string> = { cookie: options.cookie, "content-type": `multipart/form-data; boundary=${boundary}` };
  if (options.contentLength !== undefined) headers["content-length"] = String(options.contentLength);
  const request = new Request(options.url, { method: "POST", headers, body, duplex: "half" } as RequestInit);
  return { request, pulled: () => sent };
}

async function locationCounts() {
  return { sites: await getDb().$count(sites), rooms: await getDb().$count(rooms), units: await getDb().$count(storageUnits) };
}

function leftoverUploads(): string[] {
  const dir = importUploadDir();
  return fs.existsSync(dir) ? fs.readdirSync(dir) : [];
}

/** Previews and imports the file; both must be refused with the same answer, and nothing written. */
async function refusedBoth(fileName: string, bytes: Uint8Array): Promise<Answer> {
  const before = await locationCounts();
  const preview = await upload(locationPreviewRoute.POST, fileName, bytes);
  const commit = await upload(locationImportRoute.POST, fileName, bytes);
  expect(commit.status).toBe(preview.status);
  expect(commit.body).toEqual(preview.body);
  expect(await locationCounts()).toEqual(before);
  expect(leftoverUploads()).toEqual([]);
  return preview;
}

const fixture = (name: string) => new Uint8Array(fs.readFileSync(path.join(fixtures, name)));

describe("workbooks that unpack to far more than they weigh", () => {
  it("a 300 KB workbook whose one cell unpacks to 300 MB is refused from its zip directory: 413 entry_too_large", async () => {
    const bytes = fixture("bomb.xlsx");
    expect(bytes.length).toBeLessThan(400 * 1024);
    const response = await refusedBoth("bomb.xlsx", bytes);
    expect(response.status).toBe(413);
    expect(response.body).toEqual({
      error: {
        code: "entry_too_large",
        message:
          "The workbook's part xl/sharedStrings.xml unpacks to 300.0 MB; an import workbook may hold at most 100 MB in one part. " +
          "Split the data into smaller files.",
      },
    });
  });

  it("the same bomb declaring a small size is stopped while inflating, at the cell limit: 400 cell_too_long", async () => {
    const response = await refusedBoth("understated.xlsx", fixture("bomb-inline-understated.xlsx"));
    expect(response.status).toBe(400);
    expect(response.body.error).toEqual({
      code: "cell_too_long",
      message:
        "Line 2, column A (cell A2): the value has more than 32,767 characters; a cell may hold at most 32,767 (as in Excel). " +
        "Shorten it, or split it over several cells.",
    });
  });

  it("shared strings that unpack past 100 times their packed size, whatever they declare, are refused as a bomb: 400 zip_bomb", async () => {
    const response = await refusedBoth("strings.xlsx", fixture("strings-understated.xlsx"));
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("zip_bomb");
    expect(response.body.error.message).toMatch(
      /^The workbook's part xl\/sharedStrings\.xml unpacks to \d{3,} times its packed size \(4\.\d MB from \d+ KB\)\. Spreadsheet data packs to at most about 100 times smaller, so the file is refused as a decompression bomb\./,
    );
    // Stopped just past the size from which the ratio applies, far before the 90 MB the part holds.
    expect(XLSX_LIMITS.ratioFromBytes).toBe(4 * MiB);
  });

  it("a 1 MB workbook of 3 million rows stops at row 100,001: 400 too_many_rows", async () => {
    const bytes = fixture("rows.xlsx");
    expect(bytes.length).toBeGreaterThan(900 * 1024);
    expect(bytes.length).toBeLessThan(1300 * 1024);
    const response = await refusedBoth("rows.xlsx", bytes);
    expect(response.status).toBe(400);
    expect(response.body.error).toEqual({ code: "too_many_rows", message: "The file has more than 100,000 rows; split it into smaller files." });
  });
});

describe("shape limits in CSV files", () => {
  it("a 40,000-character cell is refused naming its line and column", async () => {
    const csv = `site,room_code,room_name,unit_code\nQuay Annex,Q-1,${"n".repeat(40_000)},QC-1\n`;
    const response = await refusedBoth("long.csv", new TextEncoder().encode(csv));
    expect(response.status).toBe(400);
    expect(response.body.error).toEqual({
      code: "cell_too_long",
      message: "Line 2, column C: the value has 40,000 characters; a cell may hold at most 32,767 (as in Excel). Shorten it, or split it over several cells.",
    });
  });

  it("a value in column 201 is refused", async () => {
    const header = Array.from({ length: 201 }, (_, i) => `c${i + 1}`).join(",");
    const response = await refusedBoth("wide.csv", new TextEncoder().encode(`${header}\n`));
    expect(response.status).toBe(400);
    expect(response.body.error).toEqual({
      code: "too_many_columns",
      message: "Line 1, column GS: the file has values in more than 200 columns; imports read at most 200. Delete the columns that are not part of the import.",
    });
    expect(IMPORT_LIMITS.columns).toBe(200);
  });

  it("a value in column 201 of a workbook is refused naming the cell", async () => {
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet("Data");
    sheet.addRow(["site", "room_code"]);
    sheet.getCell(2, 201).value = "stray";
    const response = await refusedBoth("wide.xlsx", new Uint8Array(await workbook.xlsx.writeBuffer()));
    expect(response.body.error).toEqual({
      code: "too_many_columns",
      message: "Line 2, column GS (cell GS2): the file has values in more than 200 columns; imports read at most 200. Delete the columns that are not part of the import.",
    });
  });
});

describe("uploads that stream on past their limit", () => {
  const csvHead = new TextEncoder().encode("site,room_code,room_name,unit_code\n");

  it("an import without Content-Length is refused at the first bytes past 10 MB: 413, the rest never read", async () => {
    const before = await locationCounts();
    const { request, pulled } = streamedUpload({
      url: "http://localhost:3999/api/v1/imports/locations/preview",
      cookie: cookies.facilities,
      fileName: "endless.csv",
      head: csvHead,
      fileBytes: 64 * MiB,
      filler: 0x61,
    });
    const response = await answer(locationPreviewRoute.POST, request);
    expect(response.status).toBe(413);
    expect(response.body.error).toEqual({
      code: "file_too_large",
      message: "The file is larger than 10 MB; imports take files up to 10 MB. Split it into smaller files.",
    });
    expect(pulled()).toBeGreaterThan(IMPORT_LIMITS.fileBytes);
    expect(pulled()).toBeLessThan(IMPORT_LIMITS.fileBytes + MULTIPART_OVERHEAD_BYTES + 4 * CHUNK);
    expect(await locationCounts()).toEqual(before);
    expect(leftoverUploads()).toEqual([]);
  });

  it("an import whose Content-Length is over the limit is refused before a byte of it is read", async () => {
    const { request, pulled } = streamedUpload({
      url: "http://localhost:3999/api/v1/imports/locations",
      cookie: cookies.facilities,
      fileName: "big.csv",
      head: csvHead,
      fileBytes: 12 * MiB,
      filler: 0x61,
      contentLength: 12 * MiB + 200,
    });
    const response = await answer(locationImportRoute.POST, request);
    expect(response.status).toBe(413);
    expect(response.body.error).toEqual({
      code: "file_too_large",
      message: "The file is about 12.0 MB; imports take files up to 10 MB. Split it into smaller files.",
    });
    expect(pulled()).toBe(0);
  });

  it("a safety data sheet without Content-Length is refused past 20 MB: 413, nothing stored", async () => {
    const filesBefore = await getDb().$count(files);
    const { request, pulled } = streamedUpload({
      url: `http://localhost:3999/api/v1/substances/${acetoneId}/sds`,
      cookie: cookies.safety_officer,
      fileName: "huge.pdf",
      head: new TextEncoder().encode("%PDF-1.4\n"),
      fileBytes: 80 * MiB,
      filler: 0x20,
    });
    const response = await answer(substanceSdsRoute.POST, request, { id: String(acetoneId) });
    expect(response.status).toBe(413);
    expect(response.body.error).toEqual({
      code: "file_too_large",
      message: "The file is larger than 20 MB; upload a smaller PDF.",
      fields: { file: ["The file is larger than 20 MB."] },
    });
    expect(pulled()).toBeGreaterThan(SDS_LIMITS.fileBytes);
    expect(pulled()).toBeLessThan(SDS_LIMITS.fileBytes + MULTIPART_OVERHEAD_BYTES + 4 * CHUNK);
    expect(await getDb().$count(files)).toBe(filesBefore);
    expect(getDb().select().from(substances).where(eq(substances.id, acetoneId)).get()!.sdsFileId).toBeNull();
  });
});

describe("good files still preview and import", () => {
  it("a small CSV: preview, then import, then the rows are there; no temporary file is left", async () => {
    const csv = "site,room_code,room_name,unit_code,unit_name,unit_kind,internal_volume_l\nQuay Annex,Q-101,Quay store,QC-1,Quay cabinet,flammable_cabinet,110\n";
    const preview = await upload(locationPreviewRoute.POST, "quay.csv", csv);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({ rowCount: 1, issues: [], toCreate: { sites: 1, rooms: 1, units: 1 } });
    const commit = await upload(locationImportRoute.POST, "quay.csv", csv);
    expect(commit.status).toBe(201);
    expect(commit.body.data.created).toEqual({ sites: 1, rooms: 1, units: 1 });
    const site = getDb().select().from(sites).where(eq(sites.name, "Quay Annex")).get()!;
    expect(getDb().select({ code: rooms.code, name: rooms.name }).from(rooms).where(eq(rooms.siteId, site.id)).all()).toEqual([{ code: "Q-101", name: "Quay store" }]);
    expect(leftoverUploads()).toEqual([]);
  });

  it("a small XLSX: preview, then import", async () => {
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet("Locations");
    sheet.addRow(["Site", "Room Code", "Room Name", "Unit Code", "Unit Name", "Unit Kind", "Internal Volume L"]);
    sheet.addRow(["Pier Workshop", "P-1", "Pier lab", "PC-1", "Pier cabinet", "flammable_cabinet", 90]);
    sheet.addRow(["Pier Workshop", "P-1", "", "PC-2", "Pier cabinet two", "flammable_cabinet", 45]);
    const bytes = new Uint8Array(await workbook.xlsx.writeBuffer());
    const preview = await upload(locationPreviewRoute.POST, "pier.xlsx", bytes);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({ rowCount: 2, issues: [], toCreate: { sites: 1, rooms: 1, units: 2 } });
    const commit = await upload(locationImportRoute.POST, "pier.xlsx", bytes);
    expect(commit.status).toBe(201);
    expect(commit.body.data.created).toEqual({ sites: 1, rooms: 1, units: 2 });
    const units = getDb()
      .select({ code: storageUnits.code, volumeL: storageUnits.internalVolumeL })
      .from(storageUnits)
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .innerJoin(sites, eq(sites.id, rooms.siteId))
      .where(eq(sites.name, "Pier Workshop"))
      .orderBy(storageUnits.code)
      .all();
    expect(units).toEqual([
      { code: "PC-1", volumeL: 90 },
      { code: "PC-2", volumeL: 45 },
    ]);
    expect(leftoverUploads()).toEqual([]);
  });
});
