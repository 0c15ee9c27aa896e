import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { readiness } from '@/lib/server/ops/readiness';

// For load balancers and orchestrators: 200 when this instance can serve (database reachable, migrations
// current, not shutting down), else 503 with the reason. Public: it says nothing about any firm.
export const GET = route(async () => {
  const r = await readiness();
  return NextResponse.json(r, { status: r.ready ? 200 : 503, headers: { 'Cache-Control': 'no-store' } });
});
