// Worker thread behind tests/support/pg-sync.ts: runs one query at a time on its own pg connection and wakes the
// waiting test thread through a shared Int32Array. Values come back as from the app's own pg settings (knexfile.ts):
// times as ISO strings, bigint counts as numbers.
import { parentPort, workerData } from 'node:worker_threads';
import pg from 'pg';

const parseDate = pg.types.getTypeParser(1184);
const iso = (s) => {
  const d = parseDate(s);
  return Number.isNaN(d.getTime()) ? s : d.toISOString();
};
const types = {
  getTypeParser(oid, format) {
    if (oid === 1184) return iso;
    if (oid === 1114) return (s) => iso(`${s}Z`);
    if (oid === 20 || oid === 1700) return (s) => Number(s);
    return pg.types.getTypeParser(oid, format ?? 'text');
  },
};

const client = new pg.Client({ connectionString: workerData.url, types });
const ready = client.connect().then(() => client.query("SET TIME ZONE 'UTC'"));
const flag = new Int32Array(workerData.flag);

let port = null;
parentPort.on('message', async (m) => {
  if (m.port) {
    port = m.port;
    return;
  }
  const { sql, params } = m;
  let reply;
  try {
    await ready;
    const r = await client.query(sql, params);
    reply = { rows: r.rows, rowCount: r.rowCount ?? 0 };
  } catch (err) {
    reply = { error: `${err.message} (in: ${sql})`, code: err.code };
  }
  port.postMessage(reply);
  Atomics.store(flag, 0, 1);
  Atomics.notify(flag, 0);
});
