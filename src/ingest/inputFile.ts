/**
 * Opening one input file safely: only regular files inside the portfolio folder are read.
 * A directory, FIFO, device or socket where a file belongs is refused before it is opened (a
 * FIFO would block the read forever); a symbolic link is followed when its target lies inside
 * the portfolio folder and refused otherwise (a shared drive must not pull in files from
 * elsewhere); a permission or I/O error becomes a message naming the cause.
 */
import { constants } from "node:fs";
import { lstat, open, realpath, stat, type FileHandle } from "node:fs/promises";
import { sep } from "node:path";

export type OpenedInput =
  | { ok: true; handle: FileHandle; sizeBytes: number }
  | { ok: false; missing: true }
  | { ok: false; missing: false; message: string; hint: string };

export type CheckedInput =
  | { ok: true; sizeBytes: number }
  | { ok: false; missing: true }
  | { ok: false; missing: false; message: string; hint: string };

/** Plain words for the file types we refuse. */
function kindOf(s: { isDirectory(): boolean; isFIFO(): boolean; isCharacterDevice(): boolean; isBlockDevice(): boolean; isSocket(): boolean }): string {
  if (s.isDirectory()) return "a folder";
  if (s.isFIFO()) return "a named pipe (FIFO)";
  if (s.isCharacterDevice() || s.isBlockDevice()) return "a device";
  if (s.isSocket()) return "a socket";
  return "not a regular file";
}

/** Words for a system error code, so messages never show a raw errno alone. */
export function describeFsError(err: unknown): string {
  const code = (err as { code?: string }).code;
  switch (code) {
    case "EACCES":
    case "EPERM":
      return "permission denied";
    case "ENOENT":
      return "it does not exist";
    case "EISDIR":
      return "it is a folder";
    case "ELOOP":
      return "too many symbolic links (a link loop?)";
    case "EIO":
      return "input/output error from the disk or network drive";
    case "ENAMETOOLONG":
      return "the path is too long";
    case "ENOSPC":
      return "no space left on the disk";
    case "EROFS":
      return "the location is read-only";
    case "EEXIST":
      return "something with that name already exists";
    case "ENOTDIR":
      return "a part of the path is a file, not a folder";
    default:
      return code ? `system error ${code}` : String((err as Error)?.message ?? err);
  }
}

const inside = (rootReal: string, target: string): boolean => target === rootReal || target.startsWith(rootReal.endsWith(sep) ? rootReal : rootReal + sep);

/**
 * Checks that `path` (inside the folder whose real path is `rootReal`) is a readable regular
 * file, following a symbolic link only when its target is inside `rootReal`.
 * Never throws; never opens the file.
 */
export async function checkInputFile(rootReal: string, path: string): Promise<CheckedInput> {
  let l;
  try {
    l = await lstat(path);
  } catch (err) {
    if ((err as { code?: string }).code === "ENOENT") return { ok: false, missing: true };
    return { ok: false, missing: false, message: `cannot read the file: ${describeFsError(err)}`, hint: "check the file's permissions" };
  }
  let s = l;
  if (l.isSymbolicLink()) {
    let target: string;
    try {
      target = await realpath(path);
      s = await stat(target);
    } catch (err) {
      return { ok: false, missing: false, message: `symbolic link cannot be followed: ${describeFsError(err)}`, hint: "point the link at an existing file inside the portfolio folder, or copy the file in" };
    }
    if (!inside(rootReal, target)) {
      return { ok: false, missing: false, message: "symbolic link points outside the portfolio folder and is not followed",
        hint: "copy the file into the portfolio folder; only files inside it are read" };
    }
  }
  if (!s.isFile()) {
    return { ok: false, missing: false, message: `this is ${kindOf(s)}, not a file`, hint: "put a regular CSV or YAML file here, or remove it" };
  }
  return { ok: true, sizeBytes: s.size };
}

/**
 * Opens a checked input file for reading. Opened non-blocking and re-checked on the handle,
 * so a FIFO swapped in after the check is still refused rather than waited on.
 */
export async function openInputFile(rootReal: string, path: string): Promise<OpenedInput> {
  const checked = await checkInputFile(rootReal, path);
  if (!checked.ok) return checked;
  let handle: FileHandle;
  try {
    handle = await open(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
  } catch (err) {
    return { ok: false, missing: false, message: `cannot open the file: ${describeFsError(err)}`, hint: "check the file's permissions" };
  }
  try {
    const s = await handle.stat();
    if (!s.isFile()) {
      await handle.close();
      return { ok: false, missing: false, message: `this is ${kindOf(s)}, not a file`, hint: "put a regular file here" };
    }
    return { ok: true, handle, sizeBytes: s.size };
  } catch (err) {
    await handle.close().catch(() => undefined);
    return { ok: false, missing: false, message: `cannot read the file: ${describeFsError(err)}`, hint: "check the disk or network drive" };
  }
}

/** Reads a whole small file (YAML) as UTF-8 text, or explains why not. */
export async function readInputText(rootReal: string, path: string, maxBytes: number): Promise<{ ok: true; text: string } | Exclude<OpenedInput, { ok: true }>> {
  const opened = await openInputFile(rootReal, path);
  if (!opened.ok) return opened;
  try {
    if (opened.sizeBytes > maxBytes) {
      return { ok: false, missing: false, message: `file is ${opened.sizeBytes.toLocaleString("en-US")} bytes, above the limit of ${maxBytes.toLocaleString("en-US")}`,
        hint: "a settings or tariff file is a few kilobytes; check this is the right file" };
    }
    return { ok: true, text: await opened.handle.readFile("utf8") };
  } catch (err) {
    return { ok: false, missing: false, message: `cannot read the file: ${describeFsError(err)}`, hint: "check the file's permissions and the drive" };
  } finally {
    await opened.handle.close().catch(() => undefined);
  }
}

export const NOT_UTF8_MESSAGE = "the file contains bytes that are not UTF-8 text (shown as \uFFFD); names may appear garbled";
export const NOT_UTF8_HINT = "save the file as UTF-8";

/** 1-based line of the first character that could not be decoded as UTF-8, or 0 when none. */
export function notUtf8Line(text: string): number {
  const i = text.indexOf("\uFFFD");
  if (i === -1) return 0;
  let line = 1;
  for (let k = text.indexOf("\n"); k !== -1 && k < i; k = text.indexOf("\n", k + 1)) line++;
  return line;
}
