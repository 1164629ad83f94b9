import type { AnalysisFailureCode } from "../../shared/schemas/analysis";

/**
 * A recording that cannot be analysed. `message` is written for the maker: what is wrong with the
 * file and what to do about it. It crosses the worker boundary as `{ ok: false, code, message }`.
 */
export class AnalysisInputError extends Error {
  readonly code: AnalysisFailureCode;
  constructor(code: AnalysisFailureCode, message: string) {
    super(message);
    this.name = "AnalysisInputError";
    this.code = code;
  }
}
