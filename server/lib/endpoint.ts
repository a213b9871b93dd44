import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { z } from 'zod';
import { AppError } from './app-error';

type Schemas = {
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
};

type Parsed<S extends Schemas> = {
  [K in keyof S]: S[K] extends z.ZodType ? z.output<S[K]> : never;
};

export type FieldProblem = { path: string; message: string };
export type InputPart = 'params' | 'query' | 'body' | '';

/** Turns zod issues into the per-field list the client shows next to inputs. */
export function issuesOf(error: z.ZodError, prefix: string): FieldProblem[] {
  return error.issues.map((issue) => ({
    path: [prefix, ...issue.path.map(String)].filter(Boolean).join('.'),
    message: issue.message,
  }));
}

/** The one 400 for input that does not match its contract: every field named, the first in the message. */
export function validationFailed(problems: FieldProblem[]): AppError {
  return new AppError('validation_failed', describe(problems), { fields: problems });
}

/** Parse one part of a request with its contract: the value, or the problems per field. */
export function checkInput<T extends z.ZodType>(
  schema: T,
  value: unknown,
  part: InputPart,
): { ok: true; data: z.output<T> } | { ok: false; problems: FieldProblem[] } {
  const result = schema.safeParse(value);
  return result.success
    ? { ok: true, data: result.data }
    : { ok: false, problems: issuesOf(result.error, part) };
}

/**
 * Parse one part of a request with its contract, or refuse it with the 400 every route gives.
 * For input `endpoint()` cannot see up front (a multipart form after upload, a body whose
 * shape depends on its media type).
 */
export function parseOr400<T extends z.ZodType>(
  schema: T,
  value: unknown,
  part: InputPart,
): z.output<T> {
  const checked = checkInput(schema, value, part);
  if (!checked.ok) throw validationFailed(checked.problems);
  return checked.data;
}

/**
 * A route handler whose params, query and body are parsed with zod first. The handler only
 * ever sees the parsed values; anything else is a 400 naming each field.
 */
export function endpoint<S extends Schemas>(
  schemas: S,
  handler: (input: Parsed<S>, req: Request, res: Response, next: NextFunction) => unknown,
): RequestHandler {
  return async (req, res, next) => {
    const input: Record<string, unknown> = {};
    const problems: FieldProblem[] = [];
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const checked = checkInput(schema, req[part] ?? (part === 'body' ? {} : undefined), part);
      if (checked.ok) input[part] = checked.data;
      else problems.push(...checked.problems);
    }
    if (problems.length > 0) throw validationFailed(problems);
    await handler(input as Parsed<S>, req, res, next);
  };
}

/** "Check body.massG: …", or a general line when the value as a whole is wrong. */
export function describe(problems: FieldProblem[]): string {
  const first = problems[0];
  if (!first) return 'Invalid input.';
  if (!first.path) return first.message;
  const more = problems.length > 1 ? ` (and ${problems.length - 1} more)` : '';
  return `Check ${first.path}: ${first.message}${more}`;
}
