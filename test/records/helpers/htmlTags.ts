/**
 * A minimal HTML tag reader for report tests: checks that elements nest and close properly and returns
 * each start tag with its attributes. Enough for benchproof's own generated pages (no comments, CDATA
 * or unquoted attributes); void elements per the WHATWG HTML standard §13.1.2.
 */
const VOID = new Set(['area', 'base', 'br', 'col', 'embed', 'hr', 'img', 'input', 'link', 'meta', 'source', 'track', 'wbr']);
/** SVG elements written self-closed (`<line …/>`). */
const SELF_CLOSED = /\/\s*>$/;

export interface Tag {
  readonly name: string;
  readonly attrs: Readonly<Record<string, string>>;
  /** Index of the tag's end in the source, to read the text that follows. */
  readonly end: number;
}

export function decodeEntities(s: string): string {
  return s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
}

/** All start tags in document order; throws when a close tag does not match the open element. */
export function readTags(html: string): Tag[] {
  const tags: Tag[] = [];
  const stack: string[] = [];
  // Blank out the doctype and the style sheet's text, keeping offsets into `html` valid.
  const blank = (m: string): string => ' '.repeat(m.length);
  const body = html.replace(/^<!DOCTYPE html>/i, blank).replace(/(?<=<style>)[\s\S]*?(?=<\/style>)/, blank);
  const re = /<(\/?)([a-zA-Z][\w-]*)((?:\s+[\w:-]+(?:="[^"]*")?)*)\s*(\/?)>/g;
  for (let m = re.exec(body); m; m = re.exec(body)) {
    const [whole, close, rawName, rawAttrs] = m;
    const name = rawName.toLowerCase();
    if (close) {
      const open = stack.pop();
      if (open !== name) throw new Error(`</${name}> closes <${open ?? 'nothing'}> at offset ${m.index}`);
      continue;
    }
    const attrs: Record<string, string> = {};
    for (const a of rawAttrs.matchAll(/([\w:-]+)(?:="([^"]*)")?/g)) attrs[a[1]] = decodeEntities(a[2] ?? '');
    tags.push({ name, attrs, end: m.index + whole.length });
    if (!VOID.has(name) && !SELF_CLOSED.test(whole)) stack.push(name);
  }
  if (stack.length) throw new Error(`unclosed elements: ${stack.join(' > ')}`);
  return tags;
}
