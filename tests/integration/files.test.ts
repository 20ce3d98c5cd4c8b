/**
 * Safety data sheet uploads and downloads through the route handlers: who may attach a sheet to
 * what, what is refused (and that a refusal writes nothing, neither a row nor a file), and the
 * headers a sheet is served with.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { auditEvents, containers, files, storageUnits, substances, users, type Role } from "@/db/schema";
import * as containersRoute from "@/app/api/v1/containers/route";
import * as containerSdsRoute from "@/app/api/v1/containers/[id]/sds/route";
import * as substanceSdsRoute from "@/app/api/v1/substances/[id]/sds/route";
import * as fileRoute from "@/app/api/v1/files/[id]/route";
import type { SessionUser } from "@/lib/auth/session";
import { inTransactionWithUploads } from "@/lib/files/storage";
import { MAX_SDS_BYTES } from "@/lib/files/validate";
import { call, sessionCookieFor } from "./helpers/world";

// uploadDir() reads the variable when it is called, so setting it here is enough.
const uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-uploads-"));
process.env.UPLOAD_DIR = uploadDir;

const cookies = {} as Record<Role, string>;
const people = {} as Record<Role, SessionUser>;
let acetoneId: number;
let researchersContainer: number;
let officersContainer: number;

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** A small but real PDF (one empty page), as a PDF writer would produce it. */
function pdfBytes(marker = "sheet"): Uint8Array {
  return new TextEncoder().encode(
    `%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] >> endobj\n% ${marker}\ntrailer << /Root 1 0 R >>\n%%EOF\n`,
  );
}

async function upload(handler: Handler, id: number, options: { cookie?: string; bytes?: Uint8Array; name?: string; type?: string; field?: string } = {}) {
  const form = new FormData();
  if (options.bytes !== undefined || options.field !== undefined) {
    const part = (options.bytes ?? pdfBytes()) as BlobPart;
    form.set(options.field ?? "file", new File([part], options.name ?? "sds.pdf", { type: options.type ?? "application/pdf" }));
  }
  const request = new Request(`http://localhost:3999/api/v1/things/${id}/sds`, {
    method: "POST",
    headers: options.cookie ? { cookie: options.cookie } : {},
    body: form,
  });
  const response = await handler(request, { params: Promise.resolve({ id: String(id) }) });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null };
}

async function download(id: number | string, cookie?: string) {
  const request = new Request(`http://localhost:3999/api/v1/files/${id}`, { headers: cookie ? { cookie } : {} });
  const response = await fileRoute.GET(request, { params: Promise.resolve({ id: String(id) }) });
  return { status: response.status, headers: response.headers, bytes: new Uint8Array(await response.arrayBuffer()) };
}

function storedOnDisk(): string[] {
  return fs.readdirSync(uploadDir).sort();
}

function fileCount(): number {
  return getDb().select({ n: count() }).from(files).get()!.n;
}

function containerRow(id: number) {
  return getDb().select().from(containers).where(eq(containers.id, id)).get()!;
}

async function logContainer(role: Role, label: string): Promise<number> {
  const response = await call(containersRoute.POST, {
    method: "POST",
    cookie: cookies[role],
    body: { label, substanceId: acetoneId, amount: 1, amountUnit: "L", storageUnitId: getDb().select({ id: storageUnits.id }).from(storageUnits).get()!.id },
  });
  expect(response.status).toBe(201);
  return response.body.data.id;
}

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  for (const role of ["admin", "safety_officer", "researcher", "facilities", "auditor"] as Role[]) {
    const row = getDb().select().from(users).where(eq(users.role, role)).get()!;
    people[role] = { id: row.id, email: row.email, name: row.name, role: row.role };
    cookies[role] = await sessionCookieFor(row);
  }
  acetoneId = getDb().select().from(substances).where(eq(substances.cas, "67-64-1")).get()!.id;
  researchersContainer = await logContainer("researcher", "HR-000123");
  officersContainer = await logContainer("safety_officer", "HR-000124");
});

afterAll(() => {
  fs.rmSync(uploadDir, { recursive: true, force: true });
});

describe("uploading a safety data sheet to a container", () => {
  it("the owner uploads a PDF: 201, the stored bytes equal the upload, the container points to it, and it is audited", async () => {
    const bytes = pdfBytes("acetone, supplier A");
    const response = await upload(containerSdsRoute.POST, researchersContainer, { cookie: cookies.researcher, bytes, name: "Acetone SDS.pdf" });
    expect(response.status).toBe(201);
    const { fileId, originalName, sizeBytes, sha256 } = response.body.data;
    expect(originalName).toBe("Acetone SDS.pdf");
    expect(sizeBytes).toBe(bytes.length);
    expect(sha256).toMatch(/^[0-9a-f]{64}$/);

    const row = getDb().select().from(files).where(eq(files.id, fileId)).get()!;
    expect(row).toMatchObject({ originalName: "Acetone SDS.pdf", contentType: "application/pdf", sizeBytes: bytes.length, sha256, uploadedById: people.researcher.id });
    expect(row.storedName).toMatch(/^[0-9a-f]{32}\.pdf$/);
    const onDisk = path.join(uploadDir, row.storedName);
    expect(new Uint8Array(fs.readFileSync(onDisk))).toEqual(bytes);
    expect(fs.statSync(onDisk).mode & 0o777).toBe(0o600);
    expect(storedOnDisk().filter((name) => name.endsWith(".tmp"))).toEqual([]);
    expect(containerRow(researchersContainer).sdsFileId).toBe(fileId);

    const audit = getDb()
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityType, "container"), eq(auditEvents.entityId, String(researchersContainer)), eq(auditEvents.action, "attach_sds")))
      .all();
    expect(audit.map((a) => a.summary)).toEqual(["Attached safety data sheet Acetone SDS.pdf to container HR-000123"]);
    expect(audit[0].actorId).toBe(people.researcher.id);
  });

  it("a researcher on someone else's container gets 403, and no row and no file is written", async () => {
    const rowsBefore = fileCount();
    const diskBefore = storedOnDisk();
    const response = await upload(containerSdsRoute.POST, officersContainer, { cookie: cookies.researcher, bytes: pdfBytes() });
    expect(response.status).toBe(403);
    expect(response.body).toEqual({ error: { code: "forbidden", message: expect.any(String) } });
    expect(fileCount()).toBe(rowsBefore);
    expect(storedOnDisk()).toEqual(diskBefore);
    expect(containerRow(officersContainer).sdsFileId).toBeNull();
  });

  it.each(["facilities", "auditor"] as Role[])("the %s role may not upload (403)", async (role) => {
    const rowsBefore = fileCount();
    expect((await upload(containerSdsRoute.POST, officersContainer, { cookie: cookies[role], bytes: pdfBytes() })).status).toBe(403);
    expect(fileCount()).toBe(rowsBefore);
  });

  it("refuses a renamed executable or HTML page, whatever its name and declared type (400, nothing written)", async () => {
    const rowsBefore = fileCount();
    const diskBefore = storedOnDisk();
    const exe = new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00, 0x00, 0x00, 0x04, 0x00]);
    const html = new TextEncoder().encode("<html><script>alert(1)</script></html>");
    for (const bytes of [exe, html]) {
      const response = await upload(containerSdsRoute.POST, researchersContainer, { cookie: cookies.researcher, bytes, name: "sds.pdf", type: "application/pdf" });
      expect(response.status).toBe(400);
      expect(response.body.error).toEqual({ code: "invalid_input", message: "This file is not a PDF.", fields: { file: ["This file is not a PDF."] } });
    }
    expect(fileCount()).toBe(rowsBefore);
    expect(storedOnDisk()).toEqual(diskBefore);
  });

  it("refuses an empty file and a request without the file field (400)", async () => {
    expect((await upload(containerSdsRoute.POST, researchersContainer, { cookie: cookies.researcher, bytes: new Uint8Array() })).body.error.message).toBe("The file is empty.");
    const missing = await upload(containerSdsRoute.POST, researchersContainer, { cookie: cookies.researcher });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.file).toEqual(["Choose a PDF file to upload."]);
  });

  it("refuses a PDF over 20 MB with 413, and nothing is written", async () => {
    const rowsBefore = fileCount();
    const diskBefore = storedOnDisk();
    const big = new Uint8Array(MAX_SDS_BYTES + 1);
    big.set(pdfBytes());
    const response = await upload(containerSdsRoute.POST, researchersContainer, { cookie: cookies.researcher, bytes: big });
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe("file_too_large");
    expect(fileCount()).toBe(rowsBefore);
    expect(storedOnDisk()).toEqual(diskBefore);
  });

  it("answers 404 for an unknown container and writes nothing", async () => {
    const rowsBefore = fileCount();
    expect((await upload(containerSdsRoute.POST, 99_999, { cookie: cookies.safety_officer, bytes: pdfBytes() })).status).toBe(404);
    expect(fileCount()).toBe(rowsBefore);
  });

  it("replacing a sheet keeps the old file as history and points to the new one", async () => {
    const first = containerRow(researchersContainer).sdsFileId!;
    const response = await upload(containerSdsRoute.POST, researchersContainer, { cookie: cookies.safety_officer, bytes: pdfBytes("revision 2"), name: "Acetone SDS rev 2.pdf" });
    expect(response.status).toBe(201);
    expect(containerRow(researchersContainer).sdsFileId).toBe(response.body.data.fileId);
    const old = getDb().select().from(files).where(eq(files.id, first)).get()!;
    expect(fs.existsSync(path.join(uploadDir, old.storedName))).toBe(true);
    const latest = getDb().select().from(auditEvents).where(eq(auditEvents.action, "attach_sds")).all().at(-1)!;
    expect(latest.summary).toBe("Attached safety data sheet Acetone SDS rev 2.pdf to container HR-000123 (replacing Acetone SDS.pdf)");
    expect(latest.before).toEqual({ sdsFileId: first, sdsFileName: "Acetone SDS.pdf" });
  });

  it("shows only the last path segment of the name, without control characters", async () => {
    const response = await upload(containerSdsRoute.POST, officersContainer, { cookie: cookies.safety_officer, bytes: pdfBytes(), name: "..\\..\\secret\u0007 sheet.pdf" });
    expect(response.status).toBe(201);
    expect(response.body.data.originalName).toBe("secret sheet.pdf");
  });
});

describe("uploading a safety data sheet to a substance", () => {
  it("a safety officer attaches one (201) and it is audited", async () => {
    const response = await upload(substanceSdsRoute.POST, acetoneId, { cookie: cookies.safety_officer, bytes: pdfBytes("library"), name: "acetone-library.pdf" });
    expect(response.status).toBe(201);
    expect(getDb().select().from(substances).where(eq(substances.id, acetoneId)).get()!.sdsFileId).toBe(response.body.data.fileId);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "substance"), eq(auditEvents.action, "attach_sds"))).all();
    expect(audit.map((a) => a.summary)).toEqual(["Attached safety data sheet acetone-library.pdf to substance acetone"]);
  });

  it("a researcher may not (403, nothing written)", async () => {
    const rowsBefore = fileCount();
    const diskBefore = storedOnDisk();
    expect((await upload(substanceSdsRoute.POST, acetoneId, { cookie: cookies.researcher, bytes: pdfBytes() })).status).toBe(403);
    expect(fileCount()).toBe(rowsBefore);
    expect(storedOnDisk()).toEqual(diskBefore);
  });
});

describe("opening a stored sheet", () => {
  it("a signed-in reader gets the bytes with headers that keep the browser from sniffing, caching or running it", async () => {
    const bytes = pdfBytes("for download");
    const created = await upload(containerSdsRoute.POST, officersContainer, { cookie: cookies.safety_officer, bytes, name: "Éthanol fiche (v2).pdf" });
    const response = await download(created.body.data.fileId, cookies.auditor);
    expect(response.status).toBe(200);
    expect(response.bytes).toEqual(bytes);
    expect(response.headers.get("content-type")).toBe("application/pdf");
    expect(response.headers.get("content-length")).toBe(String(bytes.length));
    expect(response.headers.get("content-disposition")).toBe(`inline; filename="_thanol fiche (v2).pdf"; filename*=UTF-8''%C3%89thanol%20fiche%20%28v2%29.pdf`);
    expect(response.headers.get("x-content-type-options")).toBe("nosniff");
    expect(response.headers.get("cache-control")).toBe("private, no-store");
    expect(response.headers.get("content-security-policy")).toBe("sandbox");
  });

  it("answers 401 in the error shape without a session", async () => {
    const id = containerRow(officersContainer).sdsFileId!;
    const response = await download(id);
    expect(response.status).toBe(401);
    expect(JSON.parse(new TextDecoder().decode(response.bytes))).toEqual({ error: { code: "unauthenticated", message: expect.any(String) } });
  });

  it("answers 404 in the error shape for an unknown file id", async () => {
    for (const id of [99_999, "not-a-number"]) {
      const response = await download(id, cookies.admin);
      expect(response.status).toBe(404);
      expect(JSON.parse(new TextDecoder().decode(response.bytes))).toEqual({ error: { code: "not_found", message: "That file was not found." } });
    }
  });

  it("a replaced sheet, attached to nothing, is for admins and safety officers only", async () => {
    const replaced = getDb().select().from(files).where(eq(files.originalName, "Acetone SDS.pdf")).get()!;
    expect((await download(replaced.id, cookies.researcher)).status).toBe(403);
    expect((await download(replaced.id, cookies.auditor)).status).toBe(403);
    expect((await download(replaced.id, cookies.safety_officer)).status).toBe(200);
    expect((await download(replaced.id, cookies.admin)).status).toBe(200);
  });
});

describe("never leaving a file without its row", () => {
  it("removes the written file when the transaction that records it fails", () => {
    const rowsBefore = fileCount();
    const diskBefore = storedOnDisk();
    expect(() =>
      inTransactionWithUploads(people.admin, (_tx, store) => {
        store({ bytes: pdfBytes("doomed"), originalName: "doomed.pdf" });
        expect(storedOnDisk()).toHaveLength(diskBefore.length + 1);
        throw new Error("a later write failed");
      }),
    ).toThrow("a later write failed");
    expect(fileCount()).toBe(rowsBefore);
    expect(storedOnDisk()).toEqual(diskBefore);
  });
});
