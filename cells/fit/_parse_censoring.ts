/**
 * The censoring options of a `fit` cell (issue 20 item 2):
 *
 * ```fit nitrate-trend
 * censored_by: below        # a 0/1 column: 1 where the response holds the detection limit
 * substitute: 0.5           # least squares with each limit L replaced by 0.5·L (warned;
 *                           #   the maximum-likelihood fit is shown beside it)
 * ```
 *
 * Without `censored_by`, rows are censored where the table read the
 * response written `<L` (its `below_limit`).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { type ParseContext, shown } from "../../kernel/contract/mod.ts";

/** The censoring part of a fit spec (keys present only when given). */
export interface CensoringSpec {
  censoredBy?: string;
  substitute?: number;
}

/**
 * Reads `censored_by` and `substitute`.
 *
 * @param ctx The parse context.
 * @returns The keys given.
 * @throws {CellError} For a `censored_by` that is not a name, a `substitute` outside [0, 1].
 */
export function parseCensoring(ctx: ParseContext): CensoringSpec {
  const o = ctx.options;
  const out: CensoringSpec = {};
  if (o.censored_by !== undefined && o.censored_by !== null) {
    if (typeof o.censored_by !== "string" || o.censored_by.trim() === "") {
      throw new CellError(
        `Option "censored_by" of fit "${ctx.name}" names a 0/1 column: 1 where the response holds the detection limit`,
        ["censored_by"],
      );
    }
    out.censoredBy = o.censored_by.trim();
  }
  if (o.substitute !== undefined && o.substitute !== null) {
    const f = o.substitute;
    if (typeof f !== "number" || !(f >= 0 && f <= 1)) {
      throw new CellError(
        `Option "substitute" of fit "${ctx.name}" is "${
          shown(f)
        }": the fraction of the detection limit given to censored rows, from 0 to 1 (0.5 for L/2)`,
        ["substitute"],
      );
    }
    out.substitute = f;
  }
  return out;
}
