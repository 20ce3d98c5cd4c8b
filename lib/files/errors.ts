import { DomainError } from "@/lib/errors";

/** An upload over the size limit (HTTP 413). */
export class FileTooLargeError extends DomainError {
  constructor(readonly maxBytes: number) {
    const limit = `${Math.round(maxBytes / (1024 * 1024))} MB`;
    super("file_too_large", `The file is larger than ${limit}; upload a smaller PDF.`, 413, { file: [`The file is larger than ${limit}.`] });
  }
}
