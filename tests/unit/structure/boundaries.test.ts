// The structure rules ESLint enforces, checked by linting small sources at real paths with the
// project's own configuration (ESLint's Node API, eslint.org/docs/latest/integrate/nodejs-api).
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const eslint = new ESLint({ cwd: process.cwd() });

async function restrictedImports(code: string, filePath: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return (result?.messages ?? []).filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

describe('feature isolation', () => {
  it('refuses an import of another feature, whatever the depth', async () => {
    const code = "import { useTrack } from '../../tracks/api/get-track';\nexport const x = useTrack;\n";
    const messages = await restrictedImports(code, 'src/features/runs/components/run-view.tsx');
    expect(messages).toHaveLength(1);
    expect(messages[0]).toMatch(/must not import another feature/);
    const viaSrc =
      "import { x } from '../../../features/venues/components/venues-table';\nexport const y = x;\n";
    expect(await restrictedImports(viaSrc, 'src/features/runs/components/run-view.tsx')).toHaveLength(1);
  });

  it('allows the feature itself, src/lib, src/components and shared/', async () => {
    const code = [
      "import { a } from '../api/get-run';",
      "import { b } from '../../../lib/queries/venues';",
      "import { c } from '../../../components/ui/status';",
      "import { d } from '../../../../shared/permissions';",
      'export const all = [a, b, c, d];',
      '',
    ].join('\n');
    expect(await restrictedImports(code, 'src/features/runs/components/run-view.tsx')).toEqual([]);
  });

  it('lets route pages under src/app compose features', async () => {
    const code =
      "import { useTrack } from '../../features/tracks/api/get-track';\nexport const x = useTrack;\n";
    expect(await restrictedImports(code, 'src/app/routes/track.tsx')).toEqual([]);
  });
});
