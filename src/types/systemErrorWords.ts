/**
 * Plain words for the operating system's error codes (POSIX errno names as Node.js reports them), so
 * no user reads "(ENOENT)". Meanings after POSIX.1-2017 <errno.h>; the wording is ours. An unknown code
 * is kept, in words around it, so nothing is hidden.
 */
const WORDS: Readonly<Record<string, string>> = {
  ENOENT: 'there is no file or folder at this path',
  EACCES: 'this user is not allowed to open it',
  EPERM: 'the system does not permit this operation on it',
  EISDIR: 'this is a folder, not a file',
  ENOTDIR: 'a part of the path is a file, not a folder',
  ELOOP: 'the path runs through symbolic links that loop',
  ENAMETOOLONG: 'the path is too long for this system',
  EMFILE: 'too many files are open at once',
  ENFILE: 'the system has too many files open',
  ENOSPC: 'the disk is full',
  EROFS: 'the disk is mounted read-only',
  EIO: 'the disk reported a read or write error',
  EBUSY: 'another program holds it',
  EEXIST: 'something already exists at this path',
  EADDRINUSE: 'another program already listens on this port',
  EADDRNOTAVAIL: 'this computer has no such network address',
};

/** 'there is no file or folder at this path' for ENOENT; for an unknown code, 'the system reported error CODE'. */
export function systemErrorWords(code: string | undefined): string {
  if (code === undefined || code === '') return 'the system reported an error without a code';
  return WORDS[code] ?? `the system reported error ${code}`;
}
