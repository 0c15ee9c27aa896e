import 'server-only';
import { randomUUID, randomBytes, createHash } from 'node:crypto';

export const newId = (): string => randomUUID();
export const nowIso = (): string => new Date().toISOString();
/** A URL-safe secret for links and keys; only its SHA-256 is stored. */
export const newSecret = (bytes = 32): string => randomBytes(bytes).toString('base64url');
export const sha256 = (s: string): string => createHash('sha256').update(s).digest('hex');
