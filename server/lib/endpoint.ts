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

/** Turns zod issues into the per-field list the client shows next to inputs. */
export function issuesOf(error: z.ZodError, prefix: string) {
  return error.issues.map((issue) => ({
    path: [prefix, ...issue.path.map(String)].filter(Boolean).join('.'),
    message: issue.message,
  }));
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
    const problems: { path: string; message: string }[] = [];
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const result = schema.safeParse(req[part] ?? (part === 'body' ? {} : undefined));
      if (result.success) input[part] = result.data;
      else problems.push(...issuesOf(result.error, part));
    }
    if (problems.length > 0) {
      throw new AppError('validation_failed', describe(problems), { fields: problems });
    }
    await handler(input as Parsed<S>, req, res, next);
  };
}

function describe(problems: { path: string; message: string }[]): string {
  const first = problems[0]!;
  const more = problems.length > 1 ? ` (and ${problems.length - 1} more)` : '';
  return `Check ${first.path}: ${first.message}${more}`;
}
