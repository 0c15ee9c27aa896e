/** The studio's engine web worker: checks every model with the schema (drafts may be invalid). */
import { validateModel } from './schema';
import { serveChunks } from './worker-core';

serveChunks(validateModel);
