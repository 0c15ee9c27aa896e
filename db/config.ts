import { z } from 'zod';

// The database settings of the environment are defined here, beside the code that uses them; lib/server/env.ts checks
// them with the rest of the environment at start-up.
export const databaseEnvShape = {
  DATABASE_FILE: z.string().min(1).default('.data/stochos.sqlite'),
  // Set: PostgreSQL instead of the SQLite file (several app instances can share it).
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//i, 'must start with postgres:// (or be left unset for SQLite)')
    .optional()
    .or(z.literal('').transform(() => undefined)),
};

const schema = z.object(databaseEnvShape);
let last: { file: string | undefined; url: string | undefined; target: string } | null = null;

/** The SQLite file or the PostgreSQL URL named by the environment now (tests switch databases between files). */
export function databaseTarget(): string {
  const file = process.env.DATABASE_FILE;
  const url = process.env.DATABASE_URL;
  if (last && last.file === file && last.url === url) return last.target;
  const parsed = schema.safeParse({ DATABASE_FILE: file, DATABASE_URL: url });
  if (!parsed.success) throw new Error(`Invalid environment:\n${parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n')}`);
  last = { file, url, target: parsed.data.DATABASE_URL ?? parsed.data.DATABASE_FILE };
  return last.target;
}
