// Errors of the Touchstone reader and writer, located by file name and 1-based line number.
import { EngineInputError } from "../types";

/** A Touchstone file that cannot be read (or data that cannot be written). `where` is `${name}:${line}`, or the name alone. */
export class TouchstoneError extends EngineInputError {
  /** 1-based line number, or null when the problem concerns the whole file */
  readonly line: number | null;
  constructor(name: string, line: number | null, message: string) {
    super(line === null ? name : `${name}:${line}`, message);
    this.name = "TouchstoneError";
    this.line = line;
  }
}
