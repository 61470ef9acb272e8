/**
 * The demo scenario's seeded generator: the same one the core uses for balancing and splits
 * (lib/domain/prng.ts), so every seeded step of the project draws from one implementation.
 */
export { createPrng, type Prng } from "../lib/domain/prng";
