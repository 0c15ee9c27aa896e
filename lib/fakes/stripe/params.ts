// Typed reads of decoded form parameters, raising Stripe-shaped errors that name the parameter
// the way Stripe does (`items[0][quantity]`).
import { invalidRequest } from './errors';
import type { FormObject, FormValue } from './form';

export class Params {
  constructor(
    readonly raw: FormObject,
    private readonly prefix = '',
  ) {}

  name(key: string): string {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    return this.raw[key] !== undefined;
  }

  str(key: string): string | undefined {
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (typeof v !== 'string') throw invalidRequest(`Invalid string: ${this.name(key)} must be a string.`, this.name(key));
    return v;
  }

  reqStr(key: string): string {
    const v = this.str(key);
    if (v === undefined || v === '') throw invalidRequest(`Missing required param: ${this.name(key)}.`, this.name(key));
    return v;
  }

  int(key: string, range?: { min?: number; max?: number }): number | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (!/^-?\d+$/.test(v.trim())) throw invalidRequest(`Invalid integer: ${v}`, this.name(key));
    const n = Number(v.trim());
    if (range?.min !== undefined && n < range.min) {
      throw invalidRequest(`This value must be greater than or equal to ${range.min}.`, this.name(key));
    }
    if (range?.max !== undefined && n > range.max) {
      throw invalidRequest(`This value must be less than or equal to ${range.max}.`, this.name(key));
    }
    return n;
  }

  bool(key: string): boolean | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (v === 'true') return true;
    if (v === 'false') return false;
    throw invalidRequest(`Invalid boolean: ${v}`, this.name(key));
  }

  enumOf<T extends string>(key: string, allowed: readonly T[]): T | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (!(allowed as readonly string[]).includes(v)) {
      throw invalidRequest(`Invalid ${this.name(key)}: must be one of ${allowed.join(', ')}`, this.name(key));
    }
    return v as T;
  }

  child(key: string): Params | undefined {
    const v = this.raw[key];
    if (v === undefined || v === '') return undefined;
    if (typeof v !== 'object' || Array.isArray(v)) throw invalidRequest(`Invalid object: ${this.name(key)}`, this.name(key));
    return new Params(v, this.name(key));
  }

  list(key: string): Params[] | undefined {
    const v = this.raw[key];
    if (v === undefined || v === '') return undefined;
    if (!Array.isArray(v)) throw invalidRequest(`Invalid array: ${this.name(key)}`, this.name(key));
    return v.map((item, i) => {
      if (typeof item !== 'object' || item === null || Array.isArray(item)) {
        throw invalidRequest(`Invalid object: ${this.name(key)}[${i}]`, `${this.name(key)}[${i}]`);
      }
      return new Params(item as FormObject, `${this.name(key)}[${i}]`);
    });
  }

  strings(key: string): string[] | undefined {
    const v: FormValue | undefined = this.raw[key];
    if (v === undefined || v === '') return undefined;
    if (typeof v === 'string') return [v];
    if (!Array.isArray(v) || v.some((x) => typeof x !== 'string')) {
      throw invalidRequest(`Invalid array: ${this.name(key)}`, this.name(key));
    }
    return v as string[];
  }

  /** Stripe metadata semantics: values are strings, '' deletes a key, metadata='' clears all. */
  applyMetadata(current: Record<string, string>, key = 'metadata'): Record<string, string> {
    const v = this.raw[key];
    if (v === undefined) return current;
    if (v === '') return {};
    if (typeof v !== 'object' || Array.isArray(v)) throw invalidRequest(`Invalid hash: ${this.name(key)}`, this.name(key));
    const next = { ...current };
    for (const [k, val] of Object.entries(v)) {
      if (typeof val !== 'string') throw invalidRequest(`Invalid metadata value for ${k}`, `${this.name(key)}[${k}]`);
      if (k.length > 40) throw invalidRequest(`Metadata keys can be at most 40 characters.`, `${this.name(key)}[${k}]`);
      if (val.length > 500) throw invalidRequest(`Metadata values can be at most 500 characters.`, `${this.name(key)}[${k}]`);
      if (val === '') delete next[k];
      else next[k] = val;
    }
    if (Object.keys(next).length > 50) throw invalidRequest('Metadata can have at most 50 keys.', this.name(key));
    return next;
  }

  expand(): string[] {
    return this.strings('expand') ?? [];
  }
}
