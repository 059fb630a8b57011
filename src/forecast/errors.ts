import { OhmbookError } from "../core/errors.ts";
/** Errors of the forecast stage: bad arguments from the caller, never from user files. */
export class ForecastInputError extends OhmbookError {
  constructor(message: string) {
    super(message);
    this.name = "ForecastInputError";
  }
}
