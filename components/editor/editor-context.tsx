'use client';

import { createContext, useContext } from 'react';
import type { FieldMessages } from './error-paths';

/** What every field of the editor needs besides react-hook-form's own context. */
export interface EditorContextValue {
  readOnly: boolean;
  /** Every message shown beside fields: schema and whole-model checks, the server's 422, local parse problems. */
  messages: FieldMessages;
  /** DOM id of the control that edits `path` (dotted), so the problem list can link to it. */
  idFor(path: string): string;
  /** Problems the schema cannot see (e.g. text in a pasted list of numbers); null clears. */
  setLocal(path: string, message: string | null): void;
}

export const EditorContext = createContext<EditorContextValue | null>(null);

export function useEditor(): EditorContextValue {
  const ctx = useContext(EditorContext);
  if (!ctx) throw new Error('Editor fields must be rendered inside <ModelEditor>.');
  return ctx;
}

const EMPTY: string[] = [];

/** Messages exactly at `path`. */
export function useMessages(path: string): string[] {
  return useEditor().messages[path] ?? EMPTY;
}

/** DOM id for a dotted path inside one editor (prefix keeps two editors on a page apart). */
export function domIdFor(prefix: string, path: string): string {
  return `${prefix}-${path.replace(/[^A-Za-z0-9_-]/g, '-')}`;
}
