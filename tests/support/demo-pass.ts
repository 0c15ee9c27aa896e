import { Client } from './http-client';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '@/lib/dev/seed/demo';

/** Signs in as the demo owner and reads a live pass and its signed token from the dashboard API, as a user would. */
export async function demoPass(appUrl: string): Promise<{ passId: string; token: string }> {
  const owner = new Client(appUrl);
  const who = DEMO_PEOPLE.find((p) => p.role === 'owner')!;
  const signed = await owner.signIn(who.email, DEMO_PASSWORD);
  if (!signed.ok) throw new Error(`Could not sign in as the demo owner: ${signed.error}`);
  const r = await owner.json<{ passes: { id: string; snippet: string | null }[] }>('GET', '/api/passes');
  const live = r.body.passes.find((p) => p.snippet);
  if (!live) throw new Error('The demo data has no live pass with a snippet.');
  return { passId: live.id, token: /data-stochos-token="([^"]+)"/.exec(live.snippet!)![1]! };
}
