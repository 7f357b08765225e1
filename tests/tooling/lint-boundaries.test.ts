// The import boundaries of DEVELOPERS.md ("Imports go one way"), as eslint.config.js encodes them:
// each case lints a one-line module placed in a layer and checks whether the rule fires.
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const eslint = new ESLint({ cwd: process.cwd() });

async function restrictedImports(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result!.messages.filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

describe('import boundaries', () => {
  it.each([
    ['src/lib/domain/example.ts', "import { getDb } from '../server/db';"],
    ['src/lib/domain/example.ts', "import type { Knex } from 'knex';"],
    ['src/lib/domain/example.ts', "import { z } from 'zod';"],
    ['src/lib/domain/example.ts', "import { useState } from 'react';"],
    ['src/lib/domain/example.ts', "import { defineMiddleware } from 'astro:middleware';"],
    ['src/lib/domain/example.ts', "import { readFileSync } from 'node:fs';"],
    ['src/lib/domain/example.ts', "import { MastInputSchema } from '../schemas/masts';"],
    ['src/components/map/Example.tsx', "import { getDb } from '../../lib/server/db';"],
    ['src/components/map/example.ts', "import { listMasts } from '../../lib/server/repos/masts';"],
    ['src/lib/client/example.ts', "import { getDb } from '../server/db';"],
    ['src/lib/client/example.ts', "import knex from 'knex';"],
  ])('%s may not: %s', async (filePath, code) => {
    expect(await restrictedImports(filePath, `${code}\nexport const used = 1;\n`)).toHaveLength(1);
  });

  it.each([
    ['src/lib/domain/example.ts', "import { getDistanceM } from './geodesy';"],
    ['src/lib/server/example.ts', "import { getDistanceM } from '../domain/geodesy';\nimport type { Knex } from 'knex';"],
    ['src/components/map/Example.tsx', "import { ApiError } from '../../lib/client/api';\nimport { can } from '../../lib/domain/roles';"],
    ['src/lib/client/example.ts', "import { MastInputSchema } from '../schemas/masts';"],
    ['src/pages/api/example.ts', "import { getDb } from '../../lib/server/db';"],
  ])('%s may: %s', async (filePath, code) => {
    expect(await restrictedImports(filePath, `${code}\nexport const used = 1;\n`)).toEqual([]);
  });
});
