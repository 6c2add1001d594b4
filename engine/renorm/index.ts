/** Renormalisation of S-parameters between per-port reference impedances (power waves or pseudo-waves). */
export { renormalize } from "./renormalize";
export { z0Vector, checkZ0 } from "./z0-vector";
