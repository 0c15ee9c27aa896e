import { describe, expect, it } from 'vitest';
import { ESLint } from 'eslint';

// The layer rules in eslint.config.mjs: app/ never imports db/, and db/ takes only types from lib/.
// Each check lints a small snippet as if it lived at the given path, so a rule that stops biting fails here.
const eslint = new ESLint({ cwd: process.cwd() });

async function ruleIds(code: string, filePath: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result!.messages.map((m) => m.ruleId ?? m.message);
}

describe('layer rules', { timeout: 60_000 }, () => {
  it('refuses db/ in a route handler and in a page', async () => {
    expect(await ruleIds("import { getModel } from '@/db/models';\nexport const x = getModel;\n", 'app/api/example/route.ts')).toContain('no-restricted-imports');
    expect(await ruleIds("import type { Firm } from '@/db/firms';\nexport type X = Firm;\n", 'app/app/example/page.tsx')).toContain('no-restricted-imports');
  });

  it('lets a route handler use a service', async () => {
    expect(await ruleIds("import { modelList } from '@/lib/models/service';\nexport const x = modelList;\n", 'app/api/example/route.ts')).not.toContain('no-restricted-imports');
  });

  it('refuses a value import from lib/ in db/ but allows a type import', async () => {
    expect(await ruleIds("import { env } from '@/lib/env';\nexport const x = env;\n", 'db/example.ts')).toContain('@typescript-eslint/no-restricted-imports');
    expect(await ruleIds("import type { Member } from '@/lib/auth/guard';\nexport type X = Member;\n", 'db/example.ts')).not.toContain('@typescript-eslint/no-restricted-imports');
  });

  it('leaves the demo seed out of the db/ rule', async () => {
    expect(await ruleIds("import { hashPassword } from '@/lib/auth/password';\nexport const x = hashPassword;\n", 'db/seed/example.ts')).not.toContain('@typescript-eslint/no-restricted-imports');
  });
});
