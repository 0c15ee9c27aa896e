import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { pathToFileURL } from 'node:url';

/**
 * A second `next start` of the same production build on the API tests' data folder, with its own environment
 * (for settings the shared stack cannot change, such as TRUSTED_PROXIES). Started with the socket-peer preload
 * exactly as `npm start` does.
 */
export async function startExtraApp(o: { dataDir: string; port: number; env: Record<string, string> }): Promise<{ url: string; stop: () => Promise<void> }> {
  const url = `http://localhost:${o.port}`;
  const child: ChildProcess = spawn(process.execPath, ['--import', pathToFileURL(path.resolve('lib/server/http/socket-peer.mjs')).href, path.resolve('node_modules/next/dist/bin/next'), 'start', '-p', String(o.port)], {
    env: {
      ...process.env,
      DATABASE_FILE: path.join(o.dataDir, 'stochos.sqlite'),
      APP_URL: url,
      NEXTAUTH_URL: url,
      STOCHOS_DEMO: '1',
      NEXT_TELEMETRY_DISABLED: '1',
      ...o.env,
      NODE_ENV: 'production',
      NODE_OPTIONS: '',
    },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const start = Date.now();
  for (;;) {
    if (child.exitCode !== null) throw new Error(`extra next start exited with ${child.exitCode}`);
    try {
      const res = await fetch(`${url}/api/auth/csrf`);
      if (res.status < 500) break;
    } catch {
      // not yet listening
    }
    if (Date.now() - start > 60_000) {
      child.kill('SIGTERM');
      throw new Error(`${url} did not answer within 60 s`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return {
    url,
    stop: async () => {
      if (child.exitCode !== null) return;
      const exited = new Promise<void>((r) => child.once('exit', () => r()));
      child.kill('SIGTERM');
      await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
    },
  };
}
