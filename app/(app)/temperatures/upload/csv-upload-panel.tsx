"use client";
import Link from "next/link";
import { useId, useMemo, useRef, useState, type ReactNode } from "react";
import { FileUp, Upload } from "lucide-react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { describedBy, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { formatCount, formatQuantity } from "@/lib/format/numbers";
import { CSV_DELIMITERS, DELIMITER_LABELS, type CsvMapping } from "@/lib/temperatures/csv/mapping";
import { CsvRecordReader } from "@/lib/temperatures/csv/records";
import { numberedHeaders } from "@/lib/temperatures/csv/rows";
import { DATE_ORDER_LABELS, type DateOrder } from "@/lib/temperatures/csv/timestamps";
import { fixedOffsetZones } from "@/lib/temperatures/csv/zoned-time";
import type { CsvImportResult, CsvPreview, CsvUploadInfo } from "@/lib/temperatures/csv-upload";
import type { CsvRowError } from "@/lib/temperatures/csv/rows";
import { IssueList } from "./issue-list";

export type SensorOption = { id: number; label: string };

type FieldErrors = Record<string, string[]>;
type ErrorBody = { error?: { code?: string; message?: string; fields?: FieldErrors; issues?: CsvRowError[]; issueCount?: number; issueLineCount?: number; rowCount?: number } };

/** The form's values as the selects hold them (strings; empty = not chosen). */
type Choices = {
  timeMode: "single" | "split";
  timestampColumn: string;
  dateColumn: string;
  timeColumn: string;
  temperatureColumn: string;
  unit: string;
  unitColumn: string;
  deviceIdColumn: string;
  dateOrder: string;
  timeZone: string;
  delimiter: string;
  decimalSeparator: string;
  headerLine: string;
};

const MB = 1024 * 1024;
const MAX_BYTES = 100 * MB;

function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || "UTC";
  } catch {
    return "UTC";
  }
}

function choicesFrom(info: CsvUploadInfo): Choices {
  const m = info.mapping;
  return {
    timeMode: m.dateColumn && !m.timestampColumn ? "split" : "single",
    timestampColumn: m.timestampColumn ?? "",
    dateColumn: m.dateColumn ?? "",
    timeColumn: m.timeColumn ?? "",
    temperatureColumn: m.temperatureColumn ?? "",
    unit: m.unit ?? "",
    unitColumn: m.unitColumn ?? "",
    deviceIdColumn: m.deviceIdColumn ?? "",
    dateOrder: m.dateOrder ?? "",
    timeZone: m.timeZone ?? browserTimeZone(),
    delimiter: m.delimiter ?? info.layout.delimiter,
    decimalSeparator: m.decimalSeparator ?? info.layout.decimalSeparator,
    headerLine: String(m.headerLine ?? info.layout.headerLine),
  };
}

function mappingFrom(c: Choices): CsvMapping {
  const single = c.timeMode === "single";
  return {
    delimiter: c.delimiter as CsvMapping["delimiter"],
    decimalSeparator: c.decimalSeparator as CsvMapping["decimalSeparator"],
    headerLine: Number(c.headerLine),
    timestampColumn: single ? c.timestampColumn || undefined : undefined,
    dateColumn: single ? undefined : c.dateColumn || undefined,
    timeColumn: single ? undefined : c.timeColumn || undefined,
    temperatureColumn: c.temperatureColumn,
    unit: c.unit as CsvMapping["unit"],
    unitColumn: c.unit === "column" ? c.unitColumn || undefined : undefined,
    deviceIdColumn: c.deviceIdColumn || undefined,
    dateOrder: c.dateOrder as CsvMapping["dateOrder"],
    timeZone: c.timeZone,
  };
}

/** Column names of the chosen header line, read from the sample lines the upload returned. */
function headersFor(info: CsvUploadInfo, headerLine: number, delimiter: string): string[] {
  if (headerLine === 0) return numberedHeaders(Math.max(info.layout.headers.length, ...info.layout.sampleRows.map((r) => r.cells.length)));
  if (headerLine === info.layout.headerLine && delimiter === info.layout.delimiter) return info.layout.headers;
  const line = info.layout.sampleLines.find((l) => l.line === headerLine);
  if (!line) return info.layout.headers;
  const reader = new CsvRecordReader(delimiter);
  const [record] = [...reader.push(`${line.text}\n`), ...reader.end()];
  return (record?.cells ?? []).map((c) => c.trim());
}

function formatUtc(atMs: number): string {
  return `${new Date(atMs).toISOString().slice(0, 19).replace("T", " ")} UTC`;
}

function formatInZone(atMs: number, zone: string): string {
  try {
    return new Intl.DateTimeFormat("en-GB", { timeZone: zone, year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit", timeZoneName: "shortOffset" }).format(atMs);
  } catch {
    return "—";
  }
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}

async function postJson(url: string, body: unknown): Promise<{ ok: boolean; status: number; body: unknown }> {
  const response = await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  let parsed: unknown = null;
  try {
    parsed = await response.json();
  } catch {
    parsed = null;
  }
  return { ok: response.ok, status: response.status, body: parsed };
}

function failure(status: number, body: unknown): string {
  if (status === 401) return "Your session has ended. Sign in again, then upload the file once more.";
  return (body as ErrorBody | null)?.error?.message ?? `The server answered with an error (${status}). Try again in a moment.`;
}

/**
 * Choose the sensor and the file (it is uploaded and its layout read at once), confirm the column
 * choices, preview (nothing is written), then import every reading or none.
 */
export function CsvUploadPanel({ sensors, initialSensorId }: { sensors: SensorOption[]; initialSensorId: number | null }) {
  const id = useId();
  const [sensorId, setSensorId] = useState(initialSensorId ? String(initialSensorId) : "");
  const [file, setFile] = useState<File | null>(null);
  const [upload, setUpload] = useState<CsvUploadInfo | null>(null);
  const [uploading, setUploading] = useState(false);
  const [uploadError, setUploadError] = useState<string | null>(null);
  const [choices, setChoices] = useState<Choices | null>(null);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const [preview, setPreview] = useState<CsvPreview | null>(null);
  const [previewedKey, setPreviewedKey] = useState<string | null>(null);
  const [busy, setBusy] = useState<"preview" | "import" | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [result, setResult] = useState<{ data: CsvImportResult; sensorId: number; fileName: string } | null>(null);
  const attempt = useRef(0);
  /** A new key empties the file input after an import. */
  const [fileInputKey, setFileInputKey] = useState(0);

  const timeZones = useMemo(() => {
    let zones: string[] = [];
    try {
      zones = Intl.supportedValuesOf("timeZone");
    } catch {
      zones = [];
    }
    return [{ zone: "UTC", label: "UTC" }, ...zones.filter((z) => z !== "UTC").map((zone) => ({ zone, label: zone.replace(/_/g, " ") })), ...fixedOffsetZones()];
  }, []);

  /** The file is uploaded as soon as a sensor and a file are chosen (again when either changes). */
  function startUpload(nextSensorId: string, nextFile: File | null) {
    const current = ++attempt.current;
    setUpload(null);
    setChoices(null);
    setPreview(null);
    setPreviewedKey(null);
    setMessage(null);
    setFieldErrors({});
    setUploadError(null);
    if (!nextSensorId || !nextFile) {
      setUploading(false);
      return;
    }
    setResult(null);
    if (nextFile.size > MAX_BYTES) {
      setUploadError(`The file is ${(nextFile.size / MB).toFixed(0)} MB; uploads take files up to 100 MB. Split the export into smaller files (by month, for example).`);
      return;
    }
    setUploading(true);
    const form = new FormData();
    form.append("file", nextFile);
    fetch(`/api/v1/sensors/${nextSensorId}/csv-uploads`, { method: "POST", body: form })
      .then(async (response) => {
        const body = (await response.json().catch(() => null)) as { data?: CsvUploadInfo } | ErrorBody | null;
        if (current !== attempt.current) return;
        if (response.ok && body && "data" in body && body.data) {
          setUpload(body.data);
          setChoices(choicesFrom(body.data));
        } else setUploadError(failure(response.status, body));
      })
      .catch(() => {
        if (current === attempt.current) setUploadError("The file could not be sent. Check the connection and try again.");
      })
      .finally(() => {
        if (current === attempt.current) setUploading(false);
      });
  }

  const headers = useMemo(() => (upload && choices ? headersFor(upload, Number(choices.headerLine), choices.delimiter) : []), [upload, choices]);
  const mapping = choices ? mappingFrom(choices) : null;
  const mappingKey = mapping ? JSON.stringify(mapping) : null;
  const previewIsCurrent = !!preview && previewedKey === mappingKey;
  const newReadings = preview ? preview.readingCount - preview.alreadyStored : 0;
  const canImport = previewIsCurrent && preview!.issueCount === 0 && preview!.readingCount > 0 && busy === null;

  function change<K extends keyof Choices>(key: K, value: Choices[K]) {
    setChoices((c) => {
      if (!c) return c;
      const next = { ...c, [key]: value };
      if (upload && (key === "headerLine" || key === "delimiter")) {
        // Other column names: a choice the new header row lacks is cleared.
        const names = new Set(headersFor(upload, Number(next.headerLine), next.delimiter));
        for (const column of ["timestampColumn", "dateColumn", "timeColumn", "temperatureColumn", "unitColumn", "deviceIdColumn"] as const) {
          if (next[column] && !names.has(next[column])) next[column] = "";
        }
      }
      return next;
    });
    setFieldErrors((errors) => {
      const rest = { ...errors };
      delete rest[key];
      return rest;
    });
    setMessage(null);
  }

  async function runPreview() {
    if (!upload || !mapping) return;
    setBusy("preview");
    setMessage(null);
    setResult(null);
    try {
      const { ok, status, body } = await postJson(`/api/v1/sensors/${upload.sensor.id}/csv-uploads/${upload.token}/preview`, mapping);
      if (ok) {
        setPreview((body as { data: CsvPreview }).data);
        setPreviewedKey(JSON.stringify(mapping));
        setFieldErrors({});
      } else {
        setPreview(null);
        setFieldErrors((body as ErrorBody | null)?.error?.fields ?? {});
        setMessage(failure(status, body));
      }
    } catch {
      setMessage("The preview could not be requested. Check the connection and try again.");
    } finally {
      setBusy(null);
    }
  }

  async function runImport() {
    if (!upload || !mapping || !preview) return;
    setBusy("import");
    setMessage(null);
    try {
      const { ok, status, body } = await postJson(`/api/v1/sensors/${upload.sensor.id}/csv-uploads/${upload.token}/import`, mapping);
      if (ok) {
        setResult({ data: (body as { data: CsvImportResult }).data, sensorId: upload.sensor.id, fileName: upload.fileName });
        setUpload(null);
        setChoices(null);
        setPreview(null);
        setFile(null);
        setFileInputKey((k) => k + 1);
        return;
      }
      const error = (body as ErrorBody | null)?.error;
      if (error?.code === "import_rejected" && error.issues) {
        setPreview({ ...preview, issues: error.issues, issueCount: error.issueCount ?? error.issues.length, issueLineCount: error.issueLineCount ?? 0 });
      }
      setFieldErrors(error?.fields ?? {});
      setMessage(failure(status, body));
    } catch {
      setMessage("The import could not be sent; nothing was imported. Check the connection and try again.");
    } finally {
      setBusy(null);
    }
  }

  const sensorFieldId = `${id}-sensor`;
  const fileFieldId = `${id}-file`;

  return (
    <div className="space-y-5">
      <Card title="1. Sensor and file">
        <div className="grid gap-4 md:grid-cols-2">
          <Control id={sensorFieldId} label="Sensor" hint={sensors.length ? "The logger the file comes from." : "No active sensor is registered yet."}>
            <select id={sensorFieldId} value={sensorId} onChange={(e) => {
                setSensorId(e.target.value);
                startUpload(e.target.value, file);
              }} className={inputClass} aria-describedby={`${sensorFieldId}-hint`}>
              <option value="">Choose a sensor…</option>
              {sensors.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.label}
                </option>
              ))}
            </select>
          </Control>
          <Control id={fileFieldId} label="Logger file" hint="CSV or other delimited text, up to 100 MB. It is read as soon as it is chosen; nothing is stored until you import." errors={uploadError ? [uploadError] : undefined}>
            <input
              key={fileInputKey}
              id={fileFieldId}
              type="file"
              accept=".csv,.txt,.tsv,text/csv,text/plain,text/tab-separated-values"
              onChange={(e) => {
                const chosen = e.target.files?.[0] ?? null;
                setFile(chosen);
                startUpload(sensorId, chosen);
              }}
              aria-invalid={uploadError ? true : undefined}
              aria-describedby={describedBy(fileFieldId, "hint", uploadError ? [uploadError] : undefined)}
              className="block w-full text-sm text-ink-800 file:mr-3 file:h-10 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-4 file:text-sm file:font-medium file:text-ink-900 hover:file:bg-ink-100 focus-visible:outline-2 focus-visible:outline-accent-600"
            />
          </Control>
        </div>
        {uploading ? (
          <p role="status" className="mt-3 flex items-center gap-2 text-sm text-ink-700">
            <Upload aria-hidden="true" className="size-4" /> Uploading and reading the file…
          </p>
        ) : null}
        {file && !sensorId ? <p className="mt-3 text-sm text-ink-700">Choose the sensor the file belongs to.</p> : null}
      </Card>

      {upload && choices ? (
        <Card title="2. What the file holds">
          <div className="space-y-5">
            <FileFacts upload={upload} />
            <SampleLines upload={upload} headerLine={Number(choices.headerLine)} />
            <MappingForm id={id} upload={upload} choices={choices} headers={headers} timeZones={timeZones} errors={fieldErrors} onChange={change} />
            <div className="flex flex-wrap items-center gap-3">
              <Button variant="secondary" onClick={runPreview} disabled={busy !== null} aria-busy={busy === "preview"}>
                <FileUp aria-hidden="true" className="size-4" />
                {busy === "preview" ? "Reading…" : "Preview"}
              </Button>
              <p className="text-sm text-ink-700">The preview reads the whole file with these choices and writes nothing.</p>
            </div>
            {message && !preview ? <FormMessage errors={[message]} /> : null}
          </div>
        </Card>
      ) : null}

      {upload && choices && preview ? (
        <Card title="3. Preview">
          <div className="space-y-4">
            {!previewIsCurrent ? <FormMessage errors={["A choice changed since this preview; preview again before importing."]} /> : null}
            <PreviewFacts preview={preview} timeZone={choices.timeZone} />
            <PreviewTable preview={preview} timeZone={choices.timeZone} />
            {preview.issueCount > 0 ? <IssueList issues={preview.issues} issueCount={preview.issueCount} issueLineCount={preview.issueLineCount} /> : null}
            {message ? <FormMessage errors={[message]} /> : null}
            <div className="flex flex-wrap items-center gap-3">
              <Button onClick={runImport} disabled={!canImport} aria-busy={busy === "import"} aria-describedby={`${id}-import-note`}>
                {busy === "import" ? (
                  "Importing…"
                ) : (
                  <>
                    Import readings
                    {/* The count is read out with the note the button points to. */}
                    <span aria-hidden="true" className="tabular">({formatCount(newReadings)})</span>
                  </>
                )}
              </Button>
              <p id={`${id}-import-note`} className="text-sm text-ink-700">
                {preview.issueCount > 0
                  ? `Fix the ${plural(preview.issueCount, "problem")} first (in the file, then choose it again, or in the choices above): the import stores every reading or none.`
                  : preview.readingCount === 0
                    ? "The file has no readings to store."
                    : `${plural(newReadings, "new reading")} will be stored${preview.alreadyStored ? `; ${plural(preview.alreadyStored, "reading")} already stored will be skipped` : ""}.`}
              </p>
            </div>
          </div>
        </Card>
      ) : null}

      {result ? <ImportDone result={result} /> : null}
    </div>
  );
}

function Control({ id, label, hint, errors, children }: { id: string; label: string; hint?: string; errors?: string[]; children: ReactNode }) {
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      {children}
      {errors?.length ? (
        <p id={`${id}-error`} role="alert" className="flex items-start gap-1.5 text-sm text-sev-critical">
          <span aria-hidden="true">⚠</span>
          <span>{errors.join(" ")}</span>
        </p>
      ) : hint ? (
        <p id={`${id}-hint`} className="text-xs text-ink-600">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

function FileFacts({ upload }: { upload: CsvUploadInfo }) {
  const { layout } = upload;
  const facts: [string, string][] = [
    ["File", `${upload.fileName} (${upload.sizeBytes < MB ? `${Math.max(1, Math.round(upload.sizeBytes / 1024))} kB` : `${(upload.sizeBytes / MB).toFixed(1)} MB`})`],
    ["Encoding", upload.encoding === "windows-1252" ? "Windows-1252 (not UTF-8)" : upload.encoding.toUpperCase()],
    ["Delimiter", DELIMITER_LABELS[layout.delimiter]],
    ["Decimal separator", layout.decimalSeparator === "," ? "Comma" : "Point"],
    ["Header", layout.headerLine ? `line ${layout.headerLine}` : "none found"],
  ];
  return (
    <div className="space-y-2">
      <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-5">
        {facts.map(([label, value]) => (
          <div key={label}>
            <dt className="text-xs text-ink-600">{label}</dt>
            <dd className="break-words font-medium text-ink-900">{value}</dd>
          </div>
        ))}
      </dl>
      <p className="text-sm text-ink-700">
        {upload.remembered ? "The column choices of this sensor's last import fit this file and are filled in. " : "The choices below are a first guess from the file's first lines. "}
        Check each one.
        {layout.timestampsHaveOffset ? " The timestamps carry their own UTC offset, so the time zone applies only to any without one." : ""}
      </p>
    </div>
  );
}

function SampleLines({ upload, headerLine }: { upload: CsvUploadInfo; headerLine: number }) {
  return (
    <figure className="space-y-1">
      <figcaption className="text-xs font-medium text-ink-700">The file&apos;s first lines{headerLine ? ` (line ${headerLine}, marked ▸, holds the column names)` : ""}</figcaption>
      <pre className="max-h-72 overflow-auto rounded-md border border-ink-200 bg-ink-50 p-3 font-mono text-xs leading-5 text-ink-800" tabIndex={0}>
        {upload.layout.sampleLines.map((l) => (
          <div key={l.line} className={l.line === headerLine ? "font-semibold text-ink-950" : undefined}>
            <span className="mr-3 inline-block w-8 select-none text-right text-ink-500">{l.line === headerLine ? "▸" : ""}{l.line}</span>
            {l.text.replace(/\t/g, " ⇥ ") || " "}
          </div>
        ))}
      </pre>
    </figure>
  );
}

function MappingForm({
  id,
  upload,
  choices,
  headers,
  timeZones,
  errors,
  onChange,
}: {
  id: string;
  upload: CsvUploadInfo;
  choices: Choices;
  headers: string[];
  timeZones: { zone: string; label: string }[];
  errors: FieldErrors;
  onChange: <K extends keyof Choices>(key: K, value: Choices[K]) => void;
}) {
  const columnOptions = headers.filter((h) => h !== "");
  const select = (key: keyof Choices, label: string, options: { value: string; label: string }[], opts: { placeholder?: string; hint?: string } = {}) => {
    const fieldId = `${id}-${key}`;
    const fieldErrors = errors[key];
    return (
      <Control id={fieldId} label={label} hint={opts.hint} errors={fieldErrors}>
        <select
          id={fieldId}
          value={choices[key]}
          onChange={(e) => onChange(key, e.target.value as never)}
          className={inputClass}
          aria-invalid={fieldErrors?.length ? true : undefined}
          aria-describedby={describedBy(fieldId, opts.hint, fieldErrors)}
        >
          {opts.placeholder !== undefined ? <option value="">{opts.placeholder}</option> : null}
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      </Control>
    );
  };
  const columns = columnOptions.map((h) => ({ value: h, label: h }));
  const headerLines = [
    { value: "0", label: "No header row (columns are numbered)" },
    ...upload.layout.sampleLines.filter((l) => l.text.trim() !== "").map((l) => ({ value: String(l.line), label: `Line ${l.line}: ${l.text.slice(0, 60)}` })),
  ];
  if (!headerLines.some((o) => o.value === choices.headerLine)) headerLines.push({ value: choices.headerLine, label: `Line ${choices.headerLine}` });
  const timeModeName = `${id}-time-mode`;

  return (
    <div className="space-y-4">
      <div className="grid gap-4 md:grid-cols-3">
        {select("delimiter", "Delimiter", CSV_DELIMITERS.map((d) => ({ value: d, label: DELIMITER_LABELS[d] })))}
        {select("decimalSeparator", "Decimal separator", [
          { value: ".", label: "Point (4.5)" },
          { value: ",", label: "Comma (4,5)" },
        ])}
        {select("headerLine", "Header line", headerLines)}
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink-800">The time is in</legend>
        <div className="flex flex-wrap gap-x-6 gap-y-2 text-sm">
          {(
            [
              ["single", "One column (date and time together)"],
              ["split", "Separate date and time columns"],
            ] as const
          ).map(([value, label]) => (
            <label key={value} className="inline-flex items-center gap-2">
              <input type="radio" name={timeModeName} value={value} checked={choices.timeMode === value} onChange={() => onChange("timeMode", value)} className="size-4 accent-accent-700" />
              {label}
            </label>
          ))}
        </div>
      </fieldset>

      <div className="grid gap-4 md:grid-cols-3">
        {choices.timeMode === "single" ? (
          select("timestampColumn", "Timestamp column", columns, { placeholder: "Choose a column…" })
        ) : (
          <>
            {select("dateColumn", "Date column", columns, { placeholder: "Choose a column…" })}
            {select("timeColumn", "Time column", columns, { placeholder: "Choose a column…" })}
          </>
        )}
        {select(
          "dateOrder",
          "Date order",
          (Object.keys(DATE_ORDER_LABELS) as DateOrder[]).map((o) => ({ value: o, label: DATE_ORDER_LABELS[o] })),
          { placeholder: "Choose the order…", hint: "Dates written year first (2026-07-14) are always read so." },
        )}
        {select("timeZone", "Time zone", timeZones.map((z) => ({ value: z.zone, label: z.label })), {
          hint: "The zone the logger's clock shows. A logger that ignores daylight saving time needs a fixed-offset zone (“all year”).",
        })}
      </div>

      <div className="grid gap-4 md:grid-cols-3">
        {select("temperatureColumn", "Temperature column", columns, { placeholder: "Choose a column…" })}
        {select(
          "unit",
          "Unit",
          [
            { value: "C", label: "°C" },
            { value: "F", label: "°F (stored as °C)" },
            { value: "K", label: "K (stored as °C)" },
            { value: "column", label: "Written in a column of the file" },
          ],
          { placeholder: "Choose the unit…" },
        )}
        {choices.unit === "column" ? select("unitColumn", "Column with °C or °F", columns, { placeholder: "Choose a column…" }) : null}
        {select("deviceIdColumn", "Device id column", columns, {
          placeholder: "None",
          hint: `Optional: every row must then name ${upload.sensor.externalId}, so a file from another logger is refused.`,
        })}
      </div>
    </div>
  );
}

function PreviewFacts({ preview, timeZone }: { preview: CsvPreview; timeZone: string }) {
  const facts: [string, string][] = [
    ["Rows in the file", formatCount(preview.rowCount)],
    ["Readings", formatCount(preview.readingCount)],
    ["Already stored", formatCount(preview.alreadyStored)],
    ["Repeated in the file", formatCount(preview.repeatedInFile)],
    ["Problems", formatCount(preview.issueCount)],
  ];
  return (
    <div className="space-y-2">
      <dl className="tabular grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-5">
        {facts.map(([label, value]) => (
          <div key={label}>
            <dt className="text-xs text-ink-600">{label}</dt>
            <dd className="text-lg font-semibold text-ink-900">{value}</dd>
          </div>
        ))}
      </dl>
      {preview.firstAtMs !== null && preview.lastAtMs !== null ? (
        <p className="text-sm text-ink-700">
          From {formatUtc(preview.firstAtMs)} ({formatInZone(preview.firstAtMs, timeZone)} in {timeZone}) to {formatUtc(preview.lastAtMs)} ({formatInZone(preview.lastAtMs, timeZone)}).
        </p>
      ) : null}
      {preview.conflicts > 0 ? <ConflictList preview={preview} /> : null}
    </div>
  );
}

/** Rows whose instant already holds a different stored temperature: listed, and the stored value kept. */
function ConflictList({ preview }: { preview: CsvPreview }) {
  const listed = preview.conflictRows.length < preview.conflicts ? ` The first ${formatCount(preview.conflictRows.length)} are listed.` : "";
  return (
    <div className="-mx-4 overflow-x-auto">
      <table className="tabular w-full min-w-[640px] text-sm">
        <caption className="px-4 pb-2 text-left text-sm text-ink-700">
          <span aria-hidden="true">⚠ </span>
          {plural(preview.conflicts, "conflict")}: a reading is already stored for the row&apos;s instant with another temperature. The stored values are kept; these rows are not imported.{listed}
        </caption>
        <thead>
          <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-4 py-2 font-medium">Line</th>
            <th scope="col" className="px-4 py-2 font-medium">Instant (UTC)</th>
            <th scope="col" className="px-4 py-2 text-right font-medium">In the file</th>
            <th scope="col" className="px-4 py-2 text-right font-medium">Stored (kept)</th>
          </tr>
        </thead>
        <tbody>
          {preview.conflictRows.map((row) => (
            <tr key={row.line} className="border-b border-ink-100 last:border-0">
              <th scope="row" className="px-4 py-1.5 text-left font-mono font-normal">{row.line}</th>
              <td className="px-4 py-1.5 font-mono text-xs">{formatUtc(row.atMs)}</td>
              <td className="px-4 py-1.5 text-right">{formatQuantity(row.tempC, "°C", 4)}</td>
              <td className="px-4 py-1.5 text-right">{formatQuantity(row.storedTempC, "°C", 4)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function PreviewTable({ preview, timeZone }: { preview: CsvPreview; timeZone: string }) {
  if (preview.rows.length === 0) return null;
  return (
    <div className="-mx-4 overflow-x-auto">
      <table className="tabular w-full min-w-[640px] text-sm">
        <caption className="px-4 pb-2 text-left text-sm font-medium text-ink-800">The first {preview.rows.length} readings as they will be stored</caption>
        <thead>
          <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-4 py-2 font-medium">Line</th>
            <th scope="col" className="px-4 py-2 font-medium">In the file</th>
            <th scope="col" className="px-4 py-2 font-medium">Instant (UTC)</th>
            <th scope="col" className="px-4 py-2 font-medium">In {timeZone}</th>
            <th scope="col" className="px-4 py-2 text-right font-medium">Temperature</th>
          </tr>
        </thead>
        <tbody>
          {preview.rows.map((row) => (
            <tr key={row.line} className="border-b border-ink-100 last:border-0">
              <th scope="row" className="px-4 py-1.5 text-left font-mono font-normal">{row.line}</th>
              <td className="px-4 py-1.5 font-mono text-xs">
                {row.timeText} · {row.temperatureText}
              </td>
              <td className="px-4 py-1.5 font-mono text-xs">{formatUtc(row.atMs)}</td>
              <td className="px-4 py-1.5 font-mono text-xs">{formatInZone(row.atMs, timeZone)}</td>
              <td className="px-4 py-1.5 text-right">{formatQuantity(row.tempC, "°C", 4)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function ImportDone({ result }: { result: { data: CsvImportResult; sensorId: number; fileName: string } }) {
  const { accepted, duplicates, conflicts, excursions } = result.data;
  const found = excursions.opened;
  return (
    <div role="status" className="space-y-2 rounded-md border border-ok/30 bg-ok-bg px-4 py-3 text-sm text-ok">
      <p className="font-medium">
        <span aria-hidden="true">✓ </span>
        Imported {plural(accepted, "reading")} from {result.fileName}
        {duplicates ? ` (${plural(duplicates, "duplicate")} not stored again${conflicts ? `, ${formatCount(conflicts)} of them differing from the stored reading, which was kept` : ""})` : ""}.
        {found ? ` ${plural(found, "new excursion")} found.` : " No new excursion."}
        {excursions.closed ? ` ${plural(excursions.closed, "open excursion")} ended.` : ""}
      </p>
      <p>
        <Link href={`/temperatures/sensors/${result.sensorId}`} className="font-medium text-accent-800 underline">
          Go to the sensor
        </Link>
      </p>
    </div>
  );
}
