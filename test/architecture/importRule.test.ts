/**
 * The one-way data flow (capture → analysis → spec → diagnose → records → report; cli wires them) is
 * enforced by eslint.config.js. These tests lint small probe sources as if they sat in each stage,
 * so a change to the rule that lets a backward import through fails here. House rule (no source).
 */
import { describe, it, expect } from 'vitest';
import { ESLint } from 'eslint';

const eslint = new ESLint({ cwd: process.cwd() });

async function restrictedMessages(file: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath: file });
  return result.messages.filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

describe('the import rule between stages', () => {
  it('refuses an import from a later stage', async () => {
    const msgs = await restrictedMessages('src/analysis/probe.ts', "import { parseSpec } from '../design/index.js';\nexport const p = parseSpec;\n");
    expect(msgs.join(' ')).toContain('analysis may not import from the later stage design');
    // The same holds from a file in one of analysis's subfolders.
    const nested = await restrictedMessages('src/analysis/spectrum/probe.ts', "import { parseSpec } from '../../design/index.js';\nexport const p = parseSpec;\n");
    expect(nested.join(' ')).toContain('analysis may not import from the later stage design');
  });

  it('refuses a record store import from the design stage and a report import from records', async () => {
    expect(await restrictedMessages('src/design/probe.ts', "import { openStore } from '../records/index.js';\nexport const p = openStore;\n")).toHaveLength(1);
    expect(await restrictedMessages('src/records/probe.ts', "import { createStyle } from '../report/index.js';\nexport const p = createStyle;\n")).toHaveLength(1);
  });

  it('refuses an import that bypasses another stage’s index, from a stage and from the command line', async () => {
    expect(await restrictedMessages('src/diagnose/probe.ts', "import { decideCheck } from '../design/decideCheck.js';\nexport const p = decideCheck;\n")).toHaveLength(1);
    expect(await restrictedMessages('src/cli/probe.ts', "import { parseSpec } from '../../design/parseSpec.js';\nexport const p = parseSpec;\n")).toHaveLength(1);
  });

  it('allows an earlier stage through its index and the shared types', async () => {
    const ok = "import { measureCapture } from '../analysis/index.js';\nimport type { Capture } from '../types/index.js';\nexport const p = (c: Capture) => measureCapture(c);\n";
    expect(await restrictedMessages('src/design/probe.ts', ok)).toEqual([]);
  });

  it('refuses file-system access and Math.random in the analysis stage', async () => {
    const [fsResult] = await eslint.lintText("import { readFileSync } from 'node:fs';\nexport const p = readFileSync;\n", { filePath: 'src/analysis/probe.ts' });
    expect(fsResult.messages.map((m) => m.message).join(' ')).toContain('analysis never does I/O');
    const [rnd] = await eslint.lintText('export const p = Math.random();\n', { filePath: 'src/analysis/probe.ts' });
    expect(rnd.messages.map((m) => m.ruleId)).toContain('no-restricted-properties');
  });
});
