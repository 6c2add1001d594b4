/** Complex scalar helpers over interleaved re/im storage. */
export { cabs, cabs2, cdiv, cmul } from "./scalar";
