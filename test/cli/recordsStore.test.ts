import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createContext } from '../../src/cli/context.js';
import { resolveDataDir, resolveOperator, storeCheckedUnits } from '../../src/cli/store.js';
import type { CliIo } from '../../src/cli/io.js';
import { openStore } from '../../src/records/index.js';
import { kestrelRun, KESTREL_SPEC_TEXT } from '../records/fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

let root: string;
let err: string;
const io = (env: Record<string, string> = {}): CliIo => ({
  stdout: () => {},
  stderr: (s) => {
    err += s;
  },
  stdoutIsTTY: false,
  stderrIsTTY: false,
  env,
  cwd: root,
});
beforeEach(() => {
  root = makeTempDir();
  err = '';
});
afterEach(() => removeTempDir(root));

describe('records wiring for check', () => {
  it('resolves the data folder from --data, then BENCHPROOF_DATA, then ./benchproof-data', () => {
    expect(resolveDataDir(createContext(io()), {})).toEqual({ dir: join(root, 'benchproof-data'), shown: './benchproof-data', source: 'default' });
    expect(resolveDataDir(createContext(io({ BENCHPROOF_DATA: '/srv/bench' })), {}).source).toBe('BENCHPROOF_DATA');
    expect(resolveDataDir(createContext(io({ BENCHPROOF_DATA: '/srv/bench' })), { data: 'mine' }).dir).toBe(join(root, 'mine'));
  });

  it('takes the operator from --operator, then BENCHPROOF_OPERATOR', () => {
    expect(resolveOperator(createContext(io({ BENCHPROOF_OPERATOR: 'R. Okafor' })), {})).toBe('R. Okafor');
    expect(resolveOperator(createContext(io({ BENCHPROOF_OPERATOR: 'R. Okafor' })), { operator: 'M. Lindqvist' })).toBe('M. Lindqvist');
  });

  it('stores a checked unit with its captures read from the working directory, and says where in one line', () => {
    const run = kestrelRun({ unit: 'FK-0105', startedAt: '2026-03-06T09:00:00Z' });
    mkdirSync(join(root, 'captures'));
    for (const f of run.files) writeFileSync(join(root, 'captures', f.name), f.bytes);
    const ctx = createContext(io({ BENCHPROOF_OPERATOR: 'R. Okafor' }));
    const stored = storeCheckedUnits(ctx, {}, [{ verdict: run.verdict, diagnosis: run.diagnosis }], run.startedAt, KESTREL_SPEC_TEXT);
    expect(stored).toHaveLength(1);
    expect(err).toBe(
      'benchproof: stored run 1 of FK-0105, attempt #1 (PASS) in ./benchproof-data (BENCHPROOF_DATA or --data chooses another folder); next: benchproof record FK-0105 --format html --out FK-0105-record.html\n',
    );
    const store = openStore(join(root, 'benchproof-data'), { mode: 'read' });
    expect(store.unitRecord('FK-0105')!.runs[0].operator).toBe('R. Okafor');
    expect(store.specText(run.spec.sha256)).toBe(KESTREL_SPEC_TEXT);
    store.close();
  });

  it('stores nothing and prints nothing with --no-store', () => {
    const run = kestrelRun({ unit: 'FK-0105', startedAt: '2026-03-06T09:00:00Z' });
    expect(storeCheckedUnits(createContext(io()), { store: false }, [run], run.startedAt)).toEqual([]);
    expect(err).toBe('');
  });
});
