/**
 * Reading a spec file the user named, bounded: only a regular file is read (a device such as
 * /dev/zero, a FIFO or a folder is refused at once, before a byte is read), and only up to the spec
 * stage's size limit (a larger file is refused without reading the rest). The file is opened without
 * blocking, so a FIFO with no writer cannot hang the command.
 */
import { closeSync, constants, fstatSync, openSync, readSync } from 'node:fs';
import { BenchError, systemErrorWords } from '../types/index.js';
import type { CommandContext } from './context.js';
import { resolvePath } from './context.js';

export function readSpecFile(ctx: CommandContext, file: string, maxBytes: number, example: string): string {
  let fd: number;
  try {
    fd = openSync(resolvePath(ctx.io.cwd, file), constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (err) {
    throw unreadable(file, (err as NodeJS.ErrnoException).code ?? 'read error', example);
  }
  try {
    const stat = fstatSync(fd);
    if (!stat.isFile()) {
      throw new BenchError({
        code: 'spec.not-a-file',
        file,
        problem: `the spec path is ${stat.isDirectory() ? 'a folder' : 'a device, pipe or socket'}, not a regular file; nothing was read`,
        expected: 'a YAML or JSON spec file',
        fix: `give the path of the spec file, e.g. ${example}`,
      });
    }
    if (stat.size > maxBytes) throw tooLarge(file, stat.size, maxBytes);
    // Read one byte past the limit, so a file that grew after fstat is refused too.
    const buf = Buffer.alloc(Math.min(stat.size, maxBytes) + 1);
    let got = 0;
    for (;;) {
      const n = readSync(fd, buf, got, buf.length - got, null);
      if (n === 0) break;
      got += n;
      if (got === buf.length) break;
    }
    if (got > maxBytes) throw tooLarge(file, got, maxBytes);
    return buf.subarray(0, got).toString('utf8');
  } catch (err) {
    if (err instanceof BenchError) throw err;
    throw unreadable(file, (err as NodeJS.ErrnoException).code ?? 'read error', example);
  } finally {
    closeSync(fd);
  }
}

function tooLarge(file: string, size: number, maxBytes: number): BenchError {
  return new BenchError({
    code: 'spec.too-large',
    file,
    problem: `the spec is ${size > maxBytes * 4 ? 'far ' : ''}larger than ${maxBytes / 1024 / 1024} MiB, the largest spec benchproof reads`,
    expected: `a spec file of at most ${maxBytes} bytes (a full module spec is a few KiB)`,
    fix: 'check that the path names the spec and not a capture or another file; split a huge spec per module',
  });
}

function unreadable(file: string, code: string, example: string): BenchError {
  return new BenchError({
    code: 'spec.unreadable',
    file,
    problem: `cannot read the spec: ${code === 'read error' ? 'the file could not be read' : systemErrorWords(code)}`,
    expected: 'a readable YAML or JSON spec file',
    fix: `check the path, e.g. ${example}`,
  });
}
