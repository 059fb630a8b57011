/** The site writer: view models → files on disk, written atomically. */
export { checkOutputFolder, writeSite, removeActiveScratch, makeScratchFolder, removeScratchFolder, startClientBundle, SiteWriteError, type EarlyBundle } from "./writeSite.ts";
