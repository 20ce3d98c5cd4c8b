"use client";
import { FileText } from "lucide-react";
import { useRouter } from "next/navigation";
import { useId, useRef, useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import type { SdsFileInfo } from "@/lib/files/service";
import { MAX_SDS_BYTES } from "@/lib/files/validate";
import { formatDateTime, formatNumber } from "@/lib/format/numbers";

type Target = { kind: "container" | "substance"; id: number };

const UPLOAD_PATH: Record<Target["kind"], string> = { container: "containers", substance: "substances" };

function formatSize(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${formatNumber(bytes / (1024 * 1024))} MB` : `${formatNumber(bytes / 1024)} kB`;
}

/**
 * The safety data sheet of a container or substance: the current sheet with a link to open it,
 * and, for people who may, a form to upload a new one (the old one stays in the history).
 */
export function SdsAttachment({ target, fileInfo, canUpload }: { target: Target; fileInfo: SdsFileInfo | null; canUpload: boolean }) {
  const router = useRouter();
  const inputRef = useRef<HTMLInputElement>(null);
  const inputId = useId();
  const messageId = useId();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [success, setSuccess] = useState<string | null>(null);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setError(null);
    setSuccess(null);
    const file = inputRef.current?.files?.[0];
    if (!file) return setError("Choose a PDF file to upload.");
    if (file.size > MAX_SDS_BYTES) return setError(`The file is larger than ${formatSize(MAX_SDS_BYTES)}; upload a smaller PDF.`);
    const form = new FormData();
    form.set("file", file);
    setPending(true);
    try {
      const response = await fetch(`/api/v1/${UPLOAD_PATH[target.kind]}/${target.id}/sds`, { method: "POST", body: form });
      const body = await response.json().catch(() => null);
      if (!response.ok) {
        setError(body?.error?.fields?.file?.[0] ?? body?.error?.message ?? `The upload failed (HTTP ${response.status}).`);
        return;
      }
      setSuccess(`Uploaded ${body.data.originalName} (${formatSize(body.data.sizeBytes)}).`);
      if (inputRef.current) inputRef.current.value = "";
      router.refresh();
    } catch {
      setError("The upload did not reach the server. Check the connection and try again.");
    } finally {
      setPending(false);
    }
  }

  return (
    <div className="space-y-3 text-sm">
      {fileInfo ? (
        <div className="flex items-start gap-3">
          <FileText aria-hidden="true" className="mt-0.5 size-5 shrink-0 text-ink-500" />
          <div className="min-w-0">
            <p className="font-medium text-ink-900 [overflow-wrap:anywhere]">{fileInfo.originalName}</p>
            <p className="tabular text-xs text-ink-600">
              {formatSize(fileInfo.sizeBytes)} · uploaded {formatDateTime(fileInfo.uploadedAtMs)}
              {fileInfo.uploadedBy ? ` by ${fileInfo.uploadedBy}` : ""}
            </p>
            <a href={`/api/v1/files/${fileInfo.id}`} target="_blank" rel="noopener noreferrer" className="text-accent-800 hover:underline">
              Open<span className="sr-only"> {fileInfo.originalName} (PDF, opens in a new tab)</span>
            </a>
          </div>
        </div>
      ) : (
        <p className="text-ink-600">No safety data sheet attached.</p>
      )}

      {canUpload ? (
        <form onSubmit={onSubmit} className="space-y-2" noValidate>
          <FormMessage id={messageId} errors={error ? [error] : undefined} success={success ?? undefined} />
          <label htmlFor={inputId} className="block font-medium text-ink-800">
            {fileInfo ? "Replace with a new sheet" : "Upload a sheet"} <span className="font-normal text-ink-600">(PDF, up to {formatSize(MAX_SDS_BYTES)})</span>
          </label>
          <div className="flex flex-wrap items-center gap-2">
            <input
              ref={inputRef}
              id={inputId}
              name="file"
              type="file"
              accept="application/pdf"
              aria-describedby={error || success ? messageId : undefined}
              aria-invalid={error ? true : undefined}
              onChange={() => {
                setError(null);
                setSuccess(null);
              }}
              className="block max-w-full text-sm text-ink-800 file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:text-sm file:font-medium hover:file:bg-ink-100"
            />
            <Button type="submit" variant="secondary" size="sm" disabled={pending}>
              {pending ? "Uploading…" : "Upload"}
            </Button>
          </div>
        </form>
      ) : null}
    </div>
  );
}
