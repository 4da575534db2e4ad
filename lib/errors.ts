import { z } from "zod";

/** The one error type the app raises on purpose; its code decides the HTTP status. */
export const errorStatus = {
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid_input: 422,
  rate_limited: 429,
} as const;

export type ErrorCode = keyof typeof errorStatus;

export interface FieldProblem {
  field: string;
  message: string;
}

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fieldProblems: FieldProblem[] = [],
  ) {
    super(message);
    this.name = "AppError";
  }

  get status(): number {
    return errorStatus[this.code];
  }
}

export function isAppError(error: unknown): error is AppError {
  return error instanceof AppError;
}

const databaseRefusal = z.object({ code: z.string().optional(), constraint: z.string().optional() });

/**
 * What PostgreSQL said when it refused a statement: its error code ("23505", a duplicate) and the
 * constraint, read from drizzle's wrapper (`cause`) or from pg's own error; empty for anything else.
 */
export function databaseRefusalOf(error: unknown): { code?: string; constraint?: string } {
  const wrapped = z.object({ cause: databaseRefusal }).safeParse(error);
  return wrapped.success ? wrapped.data.cause : (databaseRefusal.safeParse(error).data ?? {});
}
