import { describe, expect, it } from 'vitest';
import { ESLint } from 'eslint';

// The layer rules in eslint.config.mjs, tried on small sources at made-up paths inside each layer.
const eslint = new ESLint({ cwd: process.cwd() });

async function restricted(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(`${code}\nexport const used = 1;\n`, { filePath });
  return result.messages.filter((m) => m.ruleId === '@typescript-eslint/no-restricted-imports').map((m) => m.message);
}

describe('layer rules', { timeout: 60_000 }, () => {
  it.each([
    ['lib/core/engine/probe.ts', "import React from 'react';"],
    ['lib/core/engine/probe.ts', "import { NextResponse } from 'next/server';"],
    ['lib/core/engine/probe.ts', "import { readFileSync } from 'node:fs';"],
    ['lib/core/engine/probe.ts', "import { db } from '@/db/knex';"],
    ['lib/core/engine/probe.ts', "import { Button } from '@/components/ui/button';"],
    ['lib/core/engine/probe.ts', "import { x } from '@/app/layout';"],
    ['lib/core/charts/probe.ts', "import { requireMember } from '@/lib/server/auth/guard';"],
    ['lib/core/charts/probe.ts', "import { requireMember } from '../../server/auth/guard';"],
    ['lib/core/results/probe.ts', "import 'server-only';"],
    ['lib/server/models/probe.ts', "import { WidgetView } from '@/components/widget/widget-view';"],
    ['lib/client/probe.ts', "import { db } from '@/db/knex';"],
    ['components/models/probe.tsx', "import { db } from '@/db/knex';"],
    ['components/models/probe.tsx', "import type { Role } from '@/db/users';"],
    ['components/models/probe.tsx', "import { requireMember } from '@/lib/server/auth/guard';"],
    ['components/models/probe.tsx', "import 'server-only';"],
    ['db/probe.ts', "import { env } from '@/lib/server/env';"],
    ['db/probe.ts', "import { WidgetView } from '@/components/widget/widget-view';"],
    ['app/api/probe/route.ts', "import { getModel } from '@/db/models';"],
    ['app/app/probe/page.tsx', "import type { Firm } from '@/db/firms';"],
    ['pages/embed/probe.tsx', "import { getFirm } from '@/db/firms';"],
    ['pages/embed/probe.tsx', "import { demo } from '@/lib/dev/demo';"],
  ])('%s refuses %s', async (file, code) => {
    expect(await restricted(file, code)).toHaveLength(1);
  });

  it.each([
    ['lib/core/engine/probe.ts', "import { normalCdf } from '@/lib/core/engine/special';"],
    ['lib/core/engine/probe.ts', "import { normalCdf } from './special';"],
    ['lib/server/models/probe.ts', "import { db } from '@/db/knex';"],
    ['components/models/probe.tsx', "import { normalCdf } from '@/lib/core/engine';"],
    ['db/probe.ts', "import type { StochosModel } from '@/lib/core/engine/schema';"],
    ['app/api/probe/route.ts', "import { modelList } from '@/lib/server/models/service';"],
    ['pages/embed/probe.tsx', "import { viewerMessage } from '@/lib/server/embed/messages';"],
    ['lib/dev/seed/probe.ts', "import { hashPassword } from '@/lib/server/auth/password';"],
  ])('%s allows %s', async (file, code) => {
    expect(await restricted(file, code)).toEqual([]);
  });
});
