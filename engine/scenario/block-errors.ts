/**
 * Places a block model's error under the block's JSON path: the models say
 * "block PAD, parameter loss_db"; a scenario file is read by `blocks[2].params.loss_db`.
 */
import { EngineInputError } from "../types";

/**
 * Rewrites an EngineInputError from a block model so that its `where` is the JSON path of the block.
 *
 * @param blockWhere - JSON path of the block, e.g. `blocks[2]`
 * @param blockId - the block's id
 * @param err - what the model threw; anything but an EngineInputError is returned unchanged
 * @returns the error to throw
 * @example
 * placeBlockError("blocks[2]", "PAD", new EngineInputError("block PAD, parameter loss_db", "expected ≥ 0"));
 * // EngineInputError "blocks[2].params.loss_db: expected ≥ 0"
 */
export function placeBlockError(blockWhere: string, blockId: string, err: unknown): unknown {
  if (!(err instanceof EngineInputError)) return err;
  const message = err.message.startsWith(`${err.where}: `) ? err.message.slice(err.where.length + 2) : err.message;
  const prefix = `block ${blockId}`;
  let sub: string;
  if (err.where.startsWith(`${prefix}, parameter `)) {
    const name = err.where.slice(prefix.length + 12);
    // a switch's state sits on the block, beside its params
    sub = name === "state" ? ".state" : `.params.${name}`;
  }
  else if (err.where.startsWith(`${prefix}, `)) sub = `.${err.where.slice(prefix.length + 2)}`;
  else if (err.where === prefix || err.where === blockId) sub = "";
  else if (err.where.startsWith("params")) sub = `.${err.where}`;
  else return new EngineInputError(blockWhere, `${err.where}: ${message}`);
  return new EngineInputError(`${blockWhere}${sub}`, message);
}
