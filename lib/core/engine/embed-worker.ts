/**
 * The embed's engine web worker: published versions were checked by the server, so it runs
 * without the model schema (and zod), which keeps the embed page light. The formula parser
 * and the correlation code are loaded only for a model that uses them (optional-parts.ts).
 * The page's client prepares each run first (embed-engine.ts) and falls back to the schema
 * for the message when a dial value makes the model unusable.
 */
import { loadPartsFor } from './optional-parts';
import { serveChunks } from './worker-core';

serveChunks(null, loadPartsFor);
