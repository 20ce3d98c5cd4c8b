/** Typed domain errors. Route handlers and server actions turn them into responses at the edge. */
export type FieldErrors = Record<string, string[]>;

export class DomainError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly status: number,
    readonly fields?: FieldErrors,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class ValidationError extends DomainError {
  constructor(message: string, fields?: FieldErrors) {
    super("invalid_input", message, 400, fields);
  }
}

export class UnauthenticatedError extends DomainError {
  constructor(message = "Sign in to continue.") {
    super("unauthenticated", message, 401);
  }
}

export class InvalidCredentialsError extends DomainError {
  constructor() {
    super("invalid_credentials", "That e-mail address and password do not match an active account.", 401);
  }
}

export class ForbiddenError extends DomainError {
  constructor(message = "Your role does not allow this.") {
    super("forbidden", message, 403);
  }
}

export class NotFoundError extends DomainError {
  /** `what` names the thing ("That room" → "That room was not found."); a full sentence is kept as it is. */
  constructor(what = "That item") {
    super("not_found", /[.!?]$/.test(what.trim()) ? what.trim() : `${what} was not found.`, 404);
  }
}

export class ConflictError extends DomainError {
  constructor(message: string, fields?: FieldErrors) {
    super("conflict", message, 409, fields);
  }
}

export class RateLimitedError extends DomainError {
  constructor(
    readonly retryAfterSeconds: number,
    message = `Too many requests. Try again in ${minutesText(retryAfterSeconds)}.`,
  ) {
    super("rate_limited", message, 429);
  }
}

/** "1 minute", "15 minutes": a wait, rounded up to whole minutes. */
export function minutesText(seconds: number): string {
  const minutes = Math.max(1, Math.ceil(seconds / 60));
  return `${minutes} minute${minutes === 1 ? "" : "s"}`;
}
