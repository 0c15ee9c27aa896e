import { afterEach, describe, expect, it } from 'vitest';
import { databaseTarget } from '@/db/config';

// db/config.ts reads the database settings itself (db/ takes no code from lib/); lib/server/env.ts checks the same rules.
const saved = { file: process.env.DATABASE_FILE, url: process.env.DATABASE_URL };
const set = (name: 'DATABASE_FILE' | 'DATABASE_URL', v: string | undefined) => (v === undefined ? delete process.env[name] : (process.env[name] = v));

afterEach(() => {
  set('DATABASE_FILE', saved.file);
  set('DATABASE_URL', saved.url);
});

describe('databaseTarget', () => {
  it('names the SQLite file unless a PostgreSQL URL is set; an empty URL counts as unset', () => {
    set('DATABASE_URL', undefined);
    set('DATABASE_FILE', undefined);
    expect(databaseTarget()).toBe('.data/stochos.sqlite');
    set('DATABASE_FILE', '/tmp/x.sqlite');
    expect(databaseTarget()).toBe('/tmp/x.sqlite');
    set('DATABASE_URL', '');
    expect(databaseTarget()).toBe('/tmp/x.sqlite');
    set('DATABASE_URL', 'postgresql://u@127.0.0.1:5432/stochos');
    expect(databaseTarget()).toBe('postgresql://u@127.0.0.1:5432/stochos');
  });

  it('refuses a URL of another database, saying which setting is wrong', () => {
    set('DATABASE_URL', 'mysql://u@127.0.0.1/stochos');
    expect(() => databaseTarget()).toThrow(/DATABASE_URL: must start with postgres:\/\//);
  });
});
