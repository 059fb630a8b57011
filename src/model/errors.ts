/** The model stage raises ModelInputError (defined in src/core/errors.ts so core/linalg can raise it too). */
export { ModelInputError } from "../core/errors.ts";
