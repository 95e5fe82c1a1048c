/**
 * Splitting one line of text into fields while sniffing the layout (the first 64 KiB only; the
 * data itself goes through the byte scanner or papaparse). Quotes follow RFC 4180 §2 (a field in
 * double quotes may hold the delimiter; `""` is one quote). With the space delimiter any run of
 * spaces and tabs separates fields, and a bracketed unit (`Time (s)`) stays with its name.
 */
import type { Delimiter } from '../types/index.js';
import { parseUnitCell } from './siUnits.js';

export interface SplitLine {
  readonly fields: string[];
  /** A quoted field held the delimiter, a quote or a line break: the byte scanner cannot read it. */
  readonly complexQuotes: boolean;
  readonly quoted: boolean;
}

export function splitFields(line: string, delimiter: Delimiter): SplitLine {
  if (delimiter === ' ') return splitSpaces(line);
  if (!line.includes('"')) return { fields: line.split(delimiter).map((f) => f.trim()), complexQuotes: false, quoted: false };
  const fields: string[] = [];
  let cur = '';
  let inQuotes = false;
  let quoted = false;
  let complex = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (inQuotes) {
      if (c === '"' && line[i + 1] === '"') {
        cur += '"';
        complex = true;
        i++;
      } else if (c === '"') inQuotes = false;
      else {
        if (c === delimiter) complex = true;
        cur += c;
      }
    } else if (c === '"' && cur.trim() === '') {
      inQuotes = true;
      quoted = true;
      cur = '';
    } else if (c === delimiter) {
      fields.push(cur.trim());
      cur = '';
    } else cur += c;
  }
  fields.push(cur.trim());
  return { fields, complexQuotes: complex || inQuotes, quoted };
}

function splitSpaces(line: string): SplitLine {
  const raw = line.trim();
  if (raw === '') return { fields: [''], complexQuotes: false, quoted: false };
  const fields: string[] = [];
  for (const token of raw.split(/[ \t]+/)) {
    const last = fields.length - 1;
    // A unit in brackets stays with its name (`Time (s)`), not with a unit before it (`Volt (mV)` in a units row).
    if (last >= 0 && /^[([{]/.test(token) && !/[)\]}]$/.test(fields[last]) && parseUnitCell(fields[last]) === null) fields[last] += ` ${token}`;
    else fields.push(token);
  }
  const quoted = fields.some((f) => f.startsWith('"'));
  return { fields: fields.map((f) => f.replace(/^"(.*)"$/, '$1')), complexQuotes: quoted && /"[^"]*[ \t][^"]*"/.test(raw), quoted };
}
