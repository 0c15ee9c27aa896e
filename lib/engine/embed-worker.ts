/**
 * The embed's engine web worker: published versions were checked by the server, so it runs
 * without the model schema (and zod), which keeps the embed page light. The page's client
 * prepares each run first (embed-engine.ts) and falls back to the schema for the message
 * when a dial value makes the model unusable.
 */
import { serveChunks } from './worker-core';

serveChunks(null);
