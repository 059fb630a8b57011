/** The site writer: view models → files on disk, written atomically. */
export { checkOutputFolder, writeSite, removeActiveScratch, SiteWriteError } from "./writeSite.ts";
