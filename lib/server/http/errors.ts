import { z } from 'zod';

import type { ErrorCode, FieldErrors, ErrorBody } from '@/lib/core/api-types';

export type { ErrorCode, FieldErrors, ErrorBody };

const STATUS: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  validation_failed: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
};

/** The one error type of the server layer; `toErrorResponse` maps it to JSON. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly fields?: FieldErrors;
  readonly retryAfter?: number;
  /** A heading the message starts with, for pages that show the two apart (the embed notice). */
  readonly title?: string;

  constructor(code: ErrorCode, message: string, extra: { fields?: FieldErrors; retryAfter?: number; title?: string } = {}) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.status = STATUS[code];
    this.fields = extra.fields;
    this.retryAfter = extra.retryAfter;
    this.title = extra.title;
  }
}

export const unauthorized = (m = 'Sign in to continue.') => new AppError('unauthorized', m);
export const forbidden = (m = 'Your role does not allow this.') => new AppError('forbidden', m);
export const notFound = (what = 'That record') => new AppError('not_found', `${what} was not found.`);
export const conflict = (m: string) => new AppError('conflict', m);

/** A refusal told as a heading and a sentence: the message reads "Title. Body." and carries the title apart. */
export const titled = (code: ErrorCode, title: string, body: string) => new AppError(code, `${title}. ${body}`, { title });

/** zod issues → `{ "a.b.0": ["message"] }`; the root path is "_". */
export function fieldsFromZod(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.map(String).join('.') : '_';
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

export function validationError(error: z.ZodError, message = 'Some fields need attention.'): AppError {
  return new AppError('validation_failed', message, { fields: fieldsFromZod(error) });
}

export function fieldError(field: string, message: string): AppError {
  return new AppError('validation_failed', message, { fields: { [field]: [message] } });
}

