/** A job failure that retrying cannot fix (a bad file, a bad mapping): fail at once. */
export class PermanentJobError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "PermanentJobError";
  }
}
