/**
 * src/server (the bench page) is a wiring layer like src/cli: it may use every stage through its
 * index and the command line's helpers, and no stage may import it. House rule (no source).
 */
import { describe, it, expect } from 'vitest';
import { ESLint } from 'eslint';

const eslint = new ESLint({ cwd: process.cwd() });

async function restrictedMessages(file: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: file });
  return result.messages.filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

describe('the import rule for the bench page server', () => {
  it('refuses an import of the server from any stage', async () => {
    for (const stage of ['capture', 'analysis', 'design', 'diagnose', 'records', 'report']) {
      const msgs = await restrictedMessages(`src/${stage}/probe.ts`, "import { startBenchServer } from '../server/benchServer.js';\nexport const p = startBenchServer;\n");
      expect(msgs.join(' '), stage).toContain('no stage imports the bench page server');
    }
  });

  it('refuses a server import that bypasses a stage’s index', async () => {
    expect(await restrictedMessages('src/server/probe.ts', "import { plotDecimate } from '../analysis/plotDecimate.js';\nexport const p = plotDecimate;\n")).toHaveLength(1);
  });

  it('allows the server every stage through its index and the command line’s helpers', async () => {
    const ok = "import { plotDecimate } from '../analysis/index.js';\nimport { openStore } from '../records/index.js';\nimport { loadSpec } from '../cli/checkRun.js';\nexport const p = [plotDecimate, openStore, loadSpec];\n";
    expect(await restrictedMessages('src/server/probe.ts', ok)).toEqual([]);
  });
});
