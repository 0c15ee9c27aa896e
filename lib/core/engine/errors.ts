/** One problem with a model, located by its path in the model JSON. */
export interface ModelIssue {
  path: (string | number)[];
  message: string;
}

/** Path as text, e.g. "inputs[2].distribution.sd". */
export function pathText(path: (string | number)[]): string {
  let s = '';
  for (const p of path) s += typeof p === 'number' ? `[${p}]` : s ? `.${p}` : p;
  return s || '(model)';
}

/** The model (or the dial values applied to it) is invalid. */
export class ModelValidationError extends Error {
  readonly issues: ModelIssue[];
  constructor(issues: ModelIssue[]) {
    const first = issues[0];
    super(
      first
        ? `Invalid model: ${pathText(first.path)}: ${first.message}` + (issues.length > 1 ? ` (and ${issues.length - 1} more)` : '')
        : 'Invalid model',
    );
    this.name = 'ModelValidationError';
    this.issues = issues;
  }
}

export type SamplingErrorCode = 'acceptance-collapsed' | 'envelope-too-low' | 'acceptance-too-low';

/** A sampler could not continue honestly (rejection sampling guards). */
export class SamplingError extends Error {
  readonly code: SamplingErrorCode;
  readonly inputId: string | null;
  constructor(code: SamplingErrorCode, message: string, inputId: string | null = null) {
    super(message);
    this.name = 'SamplingError';
    this.code = code;
    this.inputId = inputId;
  }
}

/** The run was cancelled through its AbortSignal or by a newer run. */
export class RunCancelledError extends Error {
  constructor() {
    super('Run cancelled');
    this.name = 'RunCancelledError';
  }
}
