import type Database from 'better-sqlite3';

export type Persona = 'anonymous' | 'owner' | 'author' | 'checker' | 'outsider';
export const PERSONAS: Persona[] = ['anonymous', 'owner', 'author', 'checker', 'outsider'];

export interface MatrixCtx {
  db: Database.Database;
  /** The firm whose owner, author and checker are the personas. */
  firmId: string;
  appUrl: string;
}

export interface MatrixRow {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  /** The route as its folder names it, e.g. /api/team/members/[id]. */
  route: string;
  /** Called before each persona's request; returns the concrete path and body (fresh targets for mutations). */
  prepare: (ctx: MatrixCtx, persona: Persona) => Promise<{ path: string; body?: unknown; headers?: Record<string, string> }> | { path: string; body?: unknown; headers?: Record<string, string> };
  expect: Record<Persona, number | number[]>;
  note?: string;
}
