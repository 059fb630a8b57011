/** Errors of the forecast stage: bad arguments from the caller, never from user files. */
export class ForecastInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ForecastInputError";
  }
}
