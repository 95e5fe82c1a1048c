/**
 * A small tmpfs mounted for one test, to make a real full disk or read-only disk (the tests run as
 * root, so chmod does not stop writes). Without mount rights the tests that need it are skipped,
 * with a note; the simulated failures in hostilePaths.test.ts run everywhere.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, statfsSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface ScratchMount {
  readonly dir: string;
  remount(mode: 'ro' | 'rw'): void;
  /** Fill the disk until about `leaveBytes` remain free. */
  fill(leaveBytes: number): void;
  unfill(): void;
  release(): void;
}

const mountCmd = (args: string[]): boolean => spawnSync('mount', args, { stdio: 'ignore' }).status === 0;

export function mountScratch(sizeBytes: number): ScratchMount | null {
  const root = mkdtempSync(join(tmpdir(), 'benchproof-mount-'));
  const dir = join(root, 'disk');
  mkdirSync(dir);
  if (process.platform !== 'linux' || !mountCmd(['-t', 'tmpfs', '-o', `size=${sizeBytes}`, 'tmpfs', dir])) {
    rmSync(root, { recursive: true, force: true });
    return null;
  }
  const filler = join(dir, 'filler.bin');
  return {
    dir,
    remount(mode) {
      if (!mountCmd(['-o', `remount,${mode}`, dir])) throw new Error(`could not remount ${dir} ${mode}`);
    },
    fill(leaveBytes) {
      const s = statfsSync(dir);
      const free = s.bavail * s.bsize;
      writeFileSync(filler, Buffer.alloc(Math.max(0, free - leaveBytes)));
    },
    unfill() {
      rmSync(filler, { force: true });
    },
    release() {
      // A lazy unmount as a fallback, so a handle still open cannot keep the mount past the test.
      if (spawnSync('umount', [dir], { stdio: 'ignore' }).status !== 0) spawnSync('umount', ['-l', dir], { stdio: 'ignore' });
      rmSync(root, { recursive: true, force: true });
    },
  };
}

/** Whether this machine lets the tests mount a tmpfs (root with mount rights, Linux). */
export function canMount(): boolean {
  const m = mountScratch(64 * 1024);
  m?.release();
  return m !== null;
}
