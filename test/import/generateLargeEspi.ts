/**
 * Writes a large ESPI feed of 15-minute readings for the import's memory measurement:
 *   npx tsx test/import/generateLargeEspi.ts OUT.xml [MEGABYTES=100]
 * Streamed to disk; readings every 15 minutes from 2000-01-01 UTC with a deterministic pattern.
 */
import { createWriteStream } from "node:fs";
import { writeEspi } from "./espiWriter.ts";

const [out, mbText = "100"] = process.argv.slice(2);
if (!out) throw new Error("usage: generateLargeEspi.ts OUT.xml [MEGABYTES]");
const targetBytes = Number(mbText) * 1024 * 1024;
const shell = writeEspi({ intervalLength: 900, blocks: [{ start: 946684800, duration: 900, readings: [] }] });
const [head, tail] = shell.split("</IntervalBlock>") as [string, string];
const stream = createWriteStream(out);
let bytes = 0;
const write = (s: string): Promise<void> | void => {
  bytes += s.length;
  if (!stream.write(s)) return new Promise((r) => stream.once("drain", () => r()));
};
await write(head.replace(/<IntervalBlock[^>]*>[\s\S]*$/, ""));
let t = 946684800;
while (bytes < targetBytes) {
  let block = `<IntervalBlock xmlns="http://naesb.org/espi"><interval><duration>86400</duration><start>${t}</start></interval>\n`;
  for (let i = 0; i < 96; i++, t += 900) {
    block += `  <IntervalReading><cost>${(t % 997) * 13}</cost><timePeriod><duration>900</duration><start>${t}</start></timePeriod><value>${(t / 900) % 1000}</value></IntervalReading>\n`;
  }
  await write(`${block}</IntervalBlock>\n`);
}
await write(`</IntervalBlock>${tail}`.replace(/^<\/IntervalBlock>/, ""));
stream.end();
await new Promise<void>((r) => stream.on("finish", () => r()));
console.log(`${out}: ${(bytes / 1048576).toFixed(1)} MB, last start ${t}`);
