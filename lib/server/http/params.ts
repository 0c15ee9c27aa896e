import { z } from 'zod';

// The route params shared by pages and route handlers: one definition, so a page and its API agree on what an id is.

/** Any record id: a UUID as `randomUUID()` makes them. */
export const uuid = z.uuid();

/** `[id]`: one record. */
export const idParams = z.object({ id: uuid });

/** `[id]/versions/[n]`: a model and a version number (1, 2, …). */
export const versionParams = z.object({ id: uuid, n: z.coerce.number().int().min(1) });

/** `[firmId]`: a firm, on public routes. */
export const firmIdParams = z.object({ firmId: uuid });

/** `[id]` of the development mailbox: the SMTP fake's message ids, not UUIDs. */
export const mailIdParams = z.object({ id: z.string().regex(/^[A-Za-z0-9_-]{1,80}$/) });

export const isUuid = (s: string): boolean => uuid.safeParse(s).success;

/** `[id]/attachments/[index]` of the development mailbox. */
export const mailAttachmentParams = mailIdParams.extend({ index: z.coerce.number().int().min(0).max(100) });
