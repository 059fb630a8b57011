/**
 * Streaming reader of ESPI ("Green Button") Atom feeds, built on the saxes XML parser: the file is
 * read in chunks and never held whole. Each Atom entry is handed over when it closes, with its
 * links and its small ESPI resources (UsagePoint, ReadingType, …) as element trees; IntervalBlock
 * resources keep only their `interval`, and each IntervalReading is handed over on its own as it
 * closes, so memory stays bounded whatever the number of readings.
 *
 * Element names are matched by local name (an `espi:` prefix or none). Text split by comments or
 * chunk boundaries is joined; callers trim it.
 */
import { createReadStream } from "node:fs";
import { SaxesParser } from "saxes";

/** One element with its text and children (only for the small resources of a feed). */
export interface XmlNode {
  name: string;
  text: string;
  /** 1-based line of the element's start tag. */
  line: number;
  attrs: Record<string, string>;
  children: XmlNode[];
}

export interface FeedLink {
  rel: string;
  href: string;
}

/** One Atom entry, without its interval readings. */
export interface FeedEntry {
  /** 0-based position of the entry in the feed (the same in every pass over the file). */
  ordinal: number;
  line: number;
  id: string | null;
  title: string | null;
  links: FeedLink[];
  /** ESPI resources in `content`, except IntervalBlocks. */
  resources: XmlNode[];
  /** IntervalBlocks in `content`, each with its `interval` child only. */
  blocks: XmlNode[];
  readingCount: number;
}

export interface FeedHandlers {
  entry?: (entry: FeedEntry) => void;
  /** One IntervalReading; `blockIndex` is the block's index within its entry, `readingIndex` the reading's within its block. */
  reading?: (entryOrdinal: number, block: XmlNode, blockIndex: number, readingIndex: number, reading: XmlNode) => Promise<void> | null | void;
}

/** The file is not well-formed XML (or not readable); `line` is where the parser stopped. */
export class FeedSyntaxError extends Error {
  constructor(message: string, readonly line: number) {
    super(message);
    this.name = "FeedSyntaxError";
  }
}

/** The first child of `node` named `name`, or undefined. */
export function child(node: XmlNode | undefined, name: string): XmlNode | undefined {
  return node?.children.find((c) => c.name === name);
}

/** Local names, interned: a tag name from saxes is a view of the chunk (see detach). */
const names = new Map<string, string>();
function localName(name: string): string {
  let local = names.get(name);
  if (local === undefined) {
    local = detach(name.slice(name.indexOf(":") + 1));
    if (names.size < 10_000) names.set(detach(name), local);
  }
  return local;
}

/**
 * A copy of `s` that does not share memory with the string it was cut from (V8 represents long
 * substrings as views of their parent, so one kept value would pin the whole parsed chunk).
 */
function detach(s: string): string {
  return s.length < 13 ? s : Buffer.from(s, "utf8").toString("utf8");
}

/**
 * Reads `path` once from start to end, calling `handlers` for every entry and reading.
 * @returns the number of entries seen
 * @throws FeedSyntaxError when the XML is malformed or the file cannot be read
 * @example await readEspiFeed("Electric.xml", { entry: (e) => console.log(e.title) })
 */
export async function readEspiFeed(path: string, handlers: FeedHandlers): Promise<number> {
  const parser = new SaxesParser({ position: true });
  const stack: XmlNode[] = [];
  let depth = 0;
  let entry: FeedEntry | null = null;
  let entryDepth = -1;
  let contentDepth = -1;
  let ordinal = 0;
  let block: { node: XmlNode; index: number; readings: number } | null = null;
  let reading: XmlNode | null = null;
  let meta: "id" | "title" | null = null;
  // Errors of the handlers (and of the work they start) are passed on as they are, not as XML errors.
  const foreign = new Set<unknown>();
  const notXml = <T>(work: () => T): T => {
    try {
      return work();
    } catch (error) {
      foreign.add(error);
      throw error;
    }
  };
  // Work a handler started (e.g. a merge to disk) is awaited before the next chunk: back-pressure.
  const waits: Promise<void>[] = [];

  parser.on("opentag", (tag) => {
    depth++;
    const name = localName(tag.name);
    // Attributes are kept only on links: saxes hands out substrings of the chunk, and a kept
    // substring would keep the whole 1 MB chunk alive.
    const node: XmlNode = { name, text: "", line: parser.line, attrs: {}, children: [] };
    if (stack.length > 0) {
      const top = stack[stack.length - 1]!;
      if (block && top === block.node && name === "IntervalReading") reading = node;
      else top.children.push(node);
      stack.push(node);
      return;
    }
    if (entry === null) {
      if (name === "entry") {
        entry = { ordinal: ordinal++, line: parser.line, id: null, title: null, links: [], resources: [], blocks: [], readingCount: 0 };
        entryDepth = depth;
      }
      return;
    }
    if (depth === entryDepth + 1) {
      if (name === "link") {
        const attrs = tag.attributes as Record<string, string>;
        entry.links.push({ rel: detach(attrs.rel ?? ""), href: detach((attrs.href ?? "").trim()) });
      }
      else if (name === "id" || name === "title") {
        meta = name;
        stack.push(node);
      } else if (name === "content") contentDepth = depth;
      return;
    }
    if (contentDepth > 0 && depth === contentDepth + 1) {
      stack.push(node);
      if (name === "IntervalBlock") {
        block = { node, index: entry.blocks.length, readings: 0 };
        entry.blocks.push(node);
      } else entry.resources.push(node);
    }
  });

  parser.on("text", (text) => {
    // Whitespace between elements is dropped; the rest is copied out of the chunk (see detach).
    if (stack.length > 0 && /\S/.test(text)) stack[stack.length - 1]!.text += detach(text);
  });
  parser.on("cdata", (text) => {
    if (stack.length > 0) stack[stack.length - 1]!.text += text;
  });

  parser.on("closetag", () => {
    depth--;
    if (stack.length > 0) {
      const node = stack.pop()!;
      if (node === reading && block && entry) {
        const wait = notXml(() => handlers.reading?.(entry!.ordinal, block!.node, block!.index, block!.readings++, node));
        if (wait) waits.push(wait);
        entry.readingCount++;
        reading = null;
      } else if (stack.length === 0) {
        if (meta && entry) entry[meta] = node.text.trim();
        meta = null;
        block = null;
      }
      return;
    }
    if (entry !== null && depth === entryDepth - 1) {
      const done = entry;
      notXml(() => handlers.entry?.(done));
      entry = null;
      contentDepth = -1;
    } else if (contentDepth > 0 && depth === contentDepth - 1) contentDepth = -1;
  });

  try {
    const stream = createReadStream(path, { encoding: "utf8", highWaterMark: 1 << 20 });
    let first = true;
    for await (const chunk of stream as AsyncIterable<string>) {
      parser.write(first ? chunk.replace(/^\uFEFF/, "") : chunk);
      first = false;
      if (waits.length > 0) await Promise.all(waits.splice(0)).catch((error: unknown) => notXml(() => { throw error; }));
    }
    parser.close();
    await Promise.all(waits.splice(0)).catch((error: unknown) => notXml(() => { throw error; }));
  } catch (error) {
    if (foreign.has(error)) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    if (code) throw new FeedSyntaxError(`cannot read the file (${code})`, 0);
    const message = error instanceof Error ? error.message : String(error);
    // saxes prefixes "file:line:column: "; keep only the description.
    throw new FeedSyntaxError(`not well-formed XML: ${message.replace(/^.*?\d+:\d+: /, "")}`, parser.line);
  }
  return ordinal;
}
