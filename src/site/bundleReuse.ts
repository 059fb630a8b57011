/**
 * The client bundle made once per program: Vite's output depends only on the template folder's
 * assets, the site's Vite options (code) and the installed packages, so a build with a cache
 * folder keeps the bundle there, keyed by the program's fingerprint and the assets' content, and
 * the next build copies it instead of running Vite (several seconds of an incremental rebuild).
 */
import { createHash } from "node:crypto";
import { copyFile, mkdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import { dirname, join } from "node:path";
import { hashFolder } from "../core/contentHash.ts";
import type { ClientBundle } from "./clientBundle.ts";

const FORMAT = "ohmbook-bundle-cache/1";

/** Copies the relative `files` from folder `from` to folder `to`. */
export async function copyFiles(files: readonly string[], from: string, to: string): Promise<void> {
  for (const f of files) {
    await mkdir(dirname(join(to, f)), { recursive: true });
    await copyFile(join(from, f), join(to, f));
  }
}

/**
 * The client bundle written into `siteDir`: copied from `reuse.cacheDir` when this program built
 * it from the same assets before, else made by `make` (which writes it into `siteDir`) and kept there.
 */
export async function clientBundleOnce(
  contentDir: string,
  siteDir: string,
  make: () => Promise<ClientBundle>,
  reuse?: { cacheDir: string; program: string },
): Promise<{ bundle: ClientBundle; reused: boolean }> {
  if (!reuse) return { bundle: await make(), reused: false };
  const hash = createHash("sha256").update(FORMAT).update(reuse.program);
  hashFolder(hash, join(contentDir, "assets"), /./);
  const folder = join(reuse.cacheDir, `bundle-${hash.digest("hex").slice(0, 32)}`);
  try {
    const bundle = JSON.parse(await readFile(join(folder, "bundle.json"), "utf8")) as ClientBundle;
    if (Array.isArray(bundle.headTags) && Array.isArray(bundle.files)) {
      await copyFiles(bundle.files, join(folder, "files"), siteDir);
      return { bundle, reused: true };
    }
  } catch {
    // not kept yet, or damaged: build it
  }
  const bundle = await make();
  // Kept atomically: a whole folder renamed into place, so a reader never sees half a bundle.
  const temporary = `${folder}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
  try {
    await copyFiles(bundle.files, siteDir, join(temporary, "files"));
    await writeFile(join(temporary, "bundle.json"), JSON.stringify(bundle));
    await rm(folder, { recursive: true, force: true });
    await rename(temporary, folder);
  } catch {
    await rm(temporary, { recursive: true, force: true }).catch(() => undefined);
  }
  return { bundle, reused: false };
}
