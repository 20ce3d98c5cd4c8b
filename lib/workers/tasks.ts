/**
 * The work the worker threads do, by name: thin wrappers around the existing service functions, so
 * that a route handler moves a flow off the request thread with `runTask(name, args)` and nothing
 * else changes. Arguments and results cross threads by structured cloning (plain data, typed arrays,
 * MessagePorts); a task's errors arrive in the main thread as the same classes (lib/workers/errors.ts).
 *
 * Each task runs in a worker with its own database connection (WAL: the request thread keeps
 * reading while a task writes), against the database file the caller's process uses.
 */
import type { MessagePort } from "node:worker_threads";
import { runReassessmentJob } from "@/lib/assessment/jobs";
import type { SessionUser } from "@/lib/auth/session";
import { writeRegisterWorkbook, type RegisterWorkbookOptions } from "@/lib/exports/register-workbook";
import { commitContainerImport, commitLocationImport, previewContainerImport, previewLocationImport, type ImportFile } from "@/lib/imports/service";
import type { CsvMapping } from "@/lib/temperatures/csv";
import { importCsvUpload, previewCsvUpload } from "@/lib/temperatures/csv-upload";
import { ingestReadings } from "@/lib/temperatures/ingest";
import { runWarmUpFitJob } from "@/lib/temperatures/warm-up-jobs";
import { PortWritable } from "./port-stream";

type CsvUploadRef = { actor: SessionUser; sensorId: number; token: string; mapping: CsvMapping };

export const tasks = {
  // Container and location imports: parse, check every row, and (commit) write all or nothing.
  // The upload is a file on disk (streamed there within its limits by the request thread).
  "imports.previewContainers": ({ file }: { file: ImportFile }) => previewContainerImport(file),
  "imports.commitContainers": ({ actor, file }: { actor: SessionUser; file: ImportFile }) => commitContainerImport(actor, file),
  "imports.previewLocations": ({ file }: { file: ImportFile }) => previewLocationImport(file),
  "imports.commitLocations": ({ actor, file }: { actor: SessionUser; file: ImportFile }) => commitLocationImport(actor, file),

  // A logger's CSV upload (stored on disk under its token): preview and all-or-nothing import.
  "readings.previewCsvUpload": ({ actor, sensorId, token, mapping }: CsvUploadRef) => previewCsvUpload(actor, sensorId, token, mapping),
  "readings.importCsvUpload": ({ actor, sensorId, token, mapping }: CsvUploadRef) => importCsvUpload(actor, sensorId, token, mapping),

  // A big batch from the logger API, all or nothing.
  "readings.ingest": ({ readings }: { readings: unknown[] }) => {
    const { accepted, duplicates, conflicts, conflictRows } = ingestReadings(readings);
    return { accepted, duplicates, conflicts, conflictRows };
  },

  // A queued re-assessment job, batch by batch, with its progress on the job row.
  "assessment.runJob": async ({ jobId }: { jobId: number }) => {
    const job = await runReassessmentJob(jobId);
    return { id: job.id, status: job.status, progress: job.progress, total: job.total };
  },

  // A queued fit of a unit's warm-up to its recorded failures (after one of its excursions ended).
  "temperatures.fitWarmUp": ({ jobId }: { jobId: number }) => runWarmUpFitJob(jobId),

  // The register workbook, its bytes streamed to the main thread through `port`.
  "exports.registerWorkbook": async ({ port, ...options }: RegisterWorkbookOptions & { port: MessagePort }) => {
    const output = new PortWritable(port);
    try {
      return await writeRegisterWorkbook(output, options);
    } catch (error) {
      output.destroy(error instanceof Error ? error : new Error(String(error)));
      throw error;
    }
  },
};

export type Tasks = typeof tasks;
export type TaskName = keyof Tasks;
