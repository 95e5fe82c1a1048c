/**
 * The fallback reader for layouts the byte scanner does not handle (quoted fields holding the
 * delimiter, quotes or line breaks): papaparse (RFC 4180 parsing) streams rows, which go into the
 * same row sink. Row line numbers assume one row per line; a quoted line break shifts later ones.
 */
import { Readable } from 'node:stream';
import { StringDecoder } from 'node:string_decoder';
import Papa from 'papaparse';
import type { CaptureLayout, DecimalMark, Delimiter } from '../types/index.js';
import type { RowSink } from './rowSink.js';
import { blankRunError, MAX_BLANK_RUN } from './readerLimits.js';
import { parseNumberText } from './scanNumber.js';

export interface PapaLayout {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
  readonly lineEnding: CaptureLayout['lineEnding'];
  readonly firstLine: number;
  readonly columnCount: number;
}

export function readWithPapa(first: Buffer, rest: AsyncIterable<Buffer>, layout: PapaLayout, sink: RowSink, file: string): Promise<void> {
  const input = Readable.from(decodeText(first, rest));
  const width = layout.columnCount + 2;
  const vals = new Float64Array(width);
  const kinds = new Uint8Array(width);
  const exps = new Int32Array(width);
  let line = layout.firstLine;
  let blankRun = 0;
  return new Promise((resolve, reject) => {
    let failure: unknown = null;
    Papa.parse<string[]>(input as unknown as File, {
      delimiter: layout.delimiter,
      newline: layout.lineEnding === 'cr' ? '\r' : layout.lineEnding === 'crlf' ? '\r\n' : '\n',
      skipEmptyLines: false,
      chunk: (results, parser) => {
        try {
          for (const row of results.data) {
            const fields = layout.delimiter === ' ' ? row.filter((f) => f.trim() !== '') : row;
            const blank = fields.length === 0 || (fields.length === 1 && fields[0].trim() === '');
            if (blank || fields[0].trim().startsWith('#')) {
              if (++blankRun > MAX_BLANK_RUN) throw blankRunError(file, line - MAX_BLANK_RUN);
            } else {
              blankRun = 0;
              const n = Math.min(fields.length, width);
              for (let i = 0; i < n; i++) {
                const p = parseNumberText(fields[i], layout.decimalMark);
                vals[i] = p.value;
                kinds[i] = p.kind;
                exps[i] = p.quantumExp;
              }
              if (!sink.push(vals, kinds, exps, n, line) && sink.pending && sink.pending.text === '') {
                // A quoted field may hold a line break; the message quoting it stays on one line.
                sink.pending.text = fields.join(layout.delimiter).replace(/[\r\n]+/g, ' ').slice(0, 60);
              }
            }
            line++;
          }
        } catch (e) {
          failure = e;
          parser.abort();
        }
      },
      complete: () => (failure ? reject(failure) : resolve()),
      error: (e: Error) => reject(failure ?? e),
    });
  });
}

async function* decodeText(first: Buffer, rest: AsyncIterable<Buffer>): AsyncGenerator<string> {
  const decoder = new StringDecoder('utf8');
  yield decoder.write(first);
  for await (const chunk of rest) yield decoder.write(chunk);
  const tail = decoder.end();
  if (tail) yield tail;
}
