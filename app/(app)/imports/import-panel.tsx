"use client";
import Link from "next/link";
import { useId, useMemo, useState, type FormEvent } from "react";
import { ArrowDown, ArrowUp, FileSpreadsheet } from "lucide-react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { FormMessage } from "@/components/ui/form-message";
import { formatCount } from "@/lib/format/numbers";
import { IMPORT_LIMITS } from "@/lib/limits";

const LIMIT_MB = Math.round(IMPORT_LIMITS.fileBytes / (1024 * 1024));

type Issue = { line: number; column: string; value: string; message: string };
type LocationCounts = { sites: number; rooms: number; units: number };
type Counts = number | LocationCounts;
type Preview = { rowCount: number; issues: Issue[]; toCreate: Counts; toUpdate: Counts; unchanged: Counts; notices: string[] };
type Result = { created: Counts; updated: Counts; unchanged: Counts };
type ErrorBody = { error?: { code?: string; message?: string; issues?: Issue[]; fields?: Record<string, string[]> } };

type Step =
  | { kind: "idle" }
  | { kind: "checking" }
  | { kind: "checked"; preview: Preview }
  | { kind: "importing"; preview: Preview }
  | { kind: "done"; result: Result }
  | { kind: "failed"; message: string; preview?: Preview };

/**
 * Choose a file, check it (nothing is written), then import it. The chosen File stays in the
 * browser and is sent again for the import, which checks every row once more before writing.
 */
export function ImportPanel({
  kind,
  doneHref,
  doneLabel,
}: {
  kind: "containers" | "locations";
  doneHref: string;
  doneLabel: string;
}) {
  const id = useId();
  const inputId = `${id}-file`;
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | undefined>();
  const [step, setStep] = useState<Step>({ kind: "idle" });

  async function send(url: string): Promise<{ ok: boolean; status: number; body: unknown }> {
    const form = new FormData();
    form.append("file", file!);
    const response = await fetch(url, { method: "POST", body: form });
    let body: unknown = null;
    try {
      body = await response.json();
    } catch {
      body = null;
    }
    return { ok: response.ok, status: response.status, body };
  }

  function failure(status: number, body: unknown): string {
    const message = (body as ErrorBody | null)?.error?.message;
    if (status === 401) return "Your session has ended. Sign in again, then check the file once more.";
    return message ?? `The server answered with an error (${status}). Try again in a moment.`;
  }

  async function check(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (!file) {
      setFileError("Choose a CSV or XLSX file first.");
      return;
    }
    // The server refuses it too; checked here so that a large file is not sent for nothing.
    if (file.size > IMPORT_LIMITS.fileBytes) {
      setFileError(`The file is larger than ${LIMIT_MB} MB; imports take files up to ${LIMIT_MB} MB. Split it into smaller files.`);
      return;
    }
    setFileError(undefined);
    setStep({ kind: "checking" });
    try {
      const { ok, status, body } = await send(`/api/v1/imports/${kind}/preview`);
      if (ok) setStep({ kind: "checked", preview: (body as { data: Preview }).data });
      else {
        const message = failure(status, body);
        setFileError(message);
        setStep({ kind: "failed", message });
      }
    } catch {
      setStep({ kind: "failed", message: "The file could not be sent. Check the connection and try again." });
    }
  }

  async function commit(preview: Preview) {
    setStep({ kind: "importing", preview });
    try {
      const { ok, status, body } = await send(`/api/v1/imports/${kind}`);
      if (ok) {
        setStep({ kind: "done", result: (body as { data: Result }).data });
        return;
      }
      const error = (body as ErrorBody | null)?.error;
      if (error?.code === "import_rejected" && error.issues) {
        // Something in Headroom changed since the check; show the problems as they are now.
        setStep({ kind: "failed", message: error.message ?? "Nothing was imported.", preview: { ...preview, issues: error.issues } });
      } else setStep({ kind: "failed", message: failure(status, body), preview });
    } catch {
      setStep({ kind: "failed", message: "The import could not be sent; nothing was imported. Check the connection and try again.", preview });
    }
  }

  const preview = step.kind === "checked" || step.kind === "importing" ? step.preview : step.kind === "failed" ? step.preview : undefined;
  const busy = step.kind === "checking" || step.kind === "importing";
  const canImport = !!preview && preview.issues.length === 0 && preview.rowCount > 0 && !busy;
  const blockedId = `${id}-blocked`;

  return (
    <div className="space-y-5">
      <Card title="1. Choose the file and check it">
        <form onSubmit={check} className="space-y-3" noValidate>
          <div className="space-y-1.5">
            <label htmlFor={inputId} className="block text-sm font-medium text-ink-800">
              Spreadsheet (CSV or XLSX, up to {LIMIT_MB} MB)
            </label>
            <input
              id={inputId}
              name="file"
              type="file"
              accept=".csv,.xlsx,text/csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
              onChange={(event) => {
                setFile(event.target.files?.[0] ?? null);
                setFileError(undefined);
                setStep({ kind: "idle" });
              }}
              aria-invalid={fileError ? true : undefined}
              aria-describedby={fileError ? `${inputId}-error` : `${inputId}-hint`}
              className="block w-full text-sm text-ink-800 file:mr-3 file:h-10 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-4 file:text-sm file:font-medium file:text-ink-900 hover:file:bg-ink-100 focus-visible:outline-2 focus-visible:outline-accent-600"
            />
            {fileError ? (
              <p id={`${inputId}-error`} role="alert" className="flex items-start gap-1.5 text-sm text-sev-critical">
                <span aria-hidden="true">⚠</span>
                <span>{fileError}</span>
              </p>
            ) : (
              <p id={`${inputId}-hint`} className="text-xs text-ink-600">
                Checking writes nothing. The first sheet of a workbook is read; the first non-blank row is the header.
              </p>
            )}
          </div>
          <Button type="submit" variant="secondary" disabled={busy || !file} aria-busy={step.kind === "checking"}>
            <FileSpreadsheet aria-hidden="true" className="size-4" />
            {step.kind === "checking" ? "Checking…" : "Check file"}
          </Button>
        </form>
      </Card>

      {step.kind === "failed" && !preview && !fileError ? <FormMessage errors={[step.message]} /> : null}

      {preview ? (
        <Card title="2. What the import will do">
          <div className="space-y-4">
            <PreviewCounts preview={preview} />
            {preview.notices.length ? (
              <ul className="list-disc space-y-1 pl-5 text-sm text-ink-700" aria-label="Notices">
                {preview.notices.map((notice) => (
                  <li key={notice}>{notice}</li>
                ))}
              </ul>
            ) : null}
            {preview.issues.length ? <IssueTable issues={preview.issues} /> : null}
            {step.kind === "failed" ? <FormMessage errors={[step.message]} /> : null}
            <div className="flex flex-wrap items-center gap-3">
              <Button
                onClick={() => commit(preview)}
                disabled={!canImport}
                aria-busy={step.kind === "importing"}
                aria-describedby={!canImport && preview.issues.length ? blockedId : undefined}
              >
                {step.kind === "importing" ? "Importing…" : "Import"}
              </Button>
              {preview.issues.length ? (
                <p id={blockedId} className="text-sm text-ink-700">
                  Fix the {preview.issues.length === 1 ? "problem" : `${formatCount(preview.issues.length)} problems`} in the file, choose it again and check it: the
                  import writes every row or none.
                </p>
              ) : preview.rowCount === 0 ? (
                <p className="text-sm text-ink-700">The file has no rows of data.</p>
              ) : (
                <p className="text-sm text-ink-700">No problems found. The import writes every row in one go.</p>
              )}
            </div>
          </div>
        </Card>
      ) : null}

      {step.kind === "done" ? (
        <div role="status" className="space-y-2 rounded-md border border-ok/30 bg-ok-bg px-4 py-3 text-sm text-ok">
          <p className="font-medium">
            <span aria-hidden="true">✓ </span>
            Imported: {describeCounts(step.result.created)} created, {describeCounts(step.result.updated)} updated, {describeCounts(step.result.unchanged)}{" "}
            unchanged.
          </p>
          <p>
            <Link href={doneHref} className="font-medium text-accent-800 underline">
              {doneLabel}
            </Link>
          </p>
        </div>
      ) : null}
    </div>
  );
}

function describeCounts(counts: Counts): string {
  if (typeof counts === "number") return `${formatCount(counts)} ${counts === 1 ? "container" : "containers"}`;
  const parts = [
    [counts.sites, "site", "sites"],
    [counts.rooms, "room", "rooms"],
    [counts.units, "storage unit", "storage units"],
  ] as const;
  return parts.map(([n, one, many]) => `${formatCount(n)} ${n === 1 ? one : many}`).join(", ");
}

function PreviewCounts({ preview }: { preview: Preview }) {
  const cell = "px-3 py-1.5 text-right";
  if (typeof preview.toCreate === "number") {
    return (
      <dl className="tabular grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-4">
        {(
          [
            ["Rows in the file", preview.rowCount],
            ["New containers", preview.toCreate],
            ["Containers updated", preview.toUpdate as number],
            ["Unchanged", preview.unchanged as number],
          ] as const
        ).map(([label, value]) => (
          <div key={label}>
            <dt className="text-xs text-ink-600">{label}</dt>
            <dd className="text-lg font-semibold text-ink-900">{formatCount(value)}</dd>
          </div>
        ))}
      </dl>
    );
  }
  const rows = [
    ["Sites", "sites"],
    ["Rooms", "rooms"],
    ["Storage units", "units"],
  ] as const;
  const get = (counts: Counts, key: keyof LocationCounts) => (typeof counts === "number" ? counts : counts[key]);
  return (
    <div className="space-y-2">
      <p className="text-sm text-ink-700">{formatCount(preview.rowCount)} rows in the file.</p>
      <table className="tabular text-sm">
        <caption className="sr-only">What the import creates, updates and leaves unchanged</caption>
        <thead>
          <tr className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-3 py-1.5 text-left font-medium">
              Record
            </th>
            <th scope="col" className={`${cell} font-medium`}>New</th>
            <th scope="col" className={`${cell} font-medium`}>Updated</th>
            <th scope="col" className={`${cell} font-medium`}>Unchanged</th>
          </tr>
        </thead>
        <tbody>
          {rows.map(([label, key]) => (
            <tr key={key} className="border-b border-ink-100 last:border-0">
              <th scope="row" className="px-3 py-1.5 text-left font-medium text-ink-800">
                {label}
              </th>
              <td className={cell}>{formatCount(get(preview.toCreate, key))}</td>
              <td className={cell}>{formatCount(get(preview.toUpdate, key))}</td>
              <td className={cell}>{formatCount(get(preview.unchanged, key))}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function IssueTable({ issues }: { issues: Issue[] }) {
  const [descending, setDescending] = useState(false);
  const sorted = useMemo(() => {
    const copy = issues.map((issue, index) => ({ issue, index }));
    copy.sort((a, b) => (descending ? b.issue.line - a.issue.line : a.issue.line - b.issue.line) || a.index - b.index);
    return copy;
  }, [issues, descending]);
  const lines = new Set(issues.map((i) => i.line)).size;
  return (
    <div className="-mx-4 overflow-x-auto">
      <table className="w-full min-w-[640px] text-sm">
        <caption className="px-4 pb-2 text-left text-sm font-medium text-sev-critical">
          <span aria-hidden="true">⚠ </span>
          {issues.length === 1 ? "1 problem" : `${formatCount(issues.length)} problems`} on {lines === 1 ? "1 row" : `${formatCount(lines)} rows`}. Line numbers are
          the row numbers your spreadsheet program shows.
        </caption>
        <thead>
          <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-4 py-2 font-medium" aria-sort={descending ? "descending" : "ascending"}>
              <button type="button" onClick={() => setDescending((d) => !d)} className="inline-flex items-center gap-1 uppercase hover:text-ink-900">
                Line
                {descending ? <ArrowDown aria-hidden="true" className="size-3" /> : <ArrowUp aria-hidden="true" className="size-3" />}
                <span className="sr-only">{descending ? ", sorted last line first; sort first line first" : ", sorted first line first; sort last line first"}</span>
              </button>
            </th>
            <th scope="col" className="px-4 py-2 font-medium">
              Column
            </th>
            <th scope="col" className="px-4 py-2 font-medium">
              Value in the file
            </th>
            <th scope="col" className="px-4 py-2 font-medium">
              Problem
            </th>
          </tr>
        </thead>
        <tbody>
          {sorted.map(({ issue, index }) => (
            <tr key={index} className="border-b border-ink-100 align-top last:border-0">
              <th scope="row" className="tabular px-4 py-2 text-left font-mono font-normal">
                {issue.line}
              </th>
              <td className="px-4 py-2 font-mono text-xs">{issue.column}</td>
              <td className="max-w-48 truncate px-4 py-2 font-mono text-xs" title={issue.value}>
                {issue.value === "" ? <span className="text-ink-500">(empty)</span> : issue.value}
              </td>
              <td className="px-4 py-2">{issue.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
