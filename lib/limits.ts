/**
 * Every limit on what the server accepts from outside — request bodies, uploads, imports — in one
 * place, so that the README's table and the checks cannot drift apart. Sizes are bytes.
 * Pure constants: safe to import from route handlers, services, workers and tests.
 */

const MiB = 1024 * 1024;

/** JSON request bodies: over the limit → 413 before the body is parsed. */
export const JSON_BODY_LIMITS = {
  /** Every JSON write unless its route says otherwise. */
  defaultBytes: 1 * MiB,
  /** `POST /api/v1/readings`: 10,000 readings of about 80 bytes each, with room for whitespace. */
  readingsBatchBytes: 4 * MiB,
} as const;
