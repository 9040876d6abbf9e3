/**
 * The simulation's random-number generator: one independent, reproducible stream per replicate.
 *
 * Generator: Tyche-i (Neves & Araujo 2011, "Fast and small nonlinear pseudorandom number
 * generators for computer simulation", PPAM 2011, LNCS 7203:92–101), as implemented by
 * seedrandom 3.0.5 (`seedrandom.tychei`): 128 bits of state, a nonlinear ARX round per 32-bit
 * output. Measured on this machine (seedrandom 3.0.5, Node 20): 120–140 M outputs/s for 32-bit
 * and 53-bit uniforms, 1.5 µs to seed from a string; seedrandom's default ARC4 runs at 23–28 M/s
 * and takes 25 µs to seed, xor128 93–100 M/s (`npm run bench` prints the current figures).
 *
 * Streams: the stream of replicate r is seeded with the string
 * `JSON.stringify(["unitwise-sim/1", seed, scenario, hypothesis, r])`; seedrandom mixes every
 * character into the state and discards 20 rounds after the last one, and the nonlinear round
 * separates streams whose keys differ in one character (tested: streams of adjacent replicates
 * are uncorrelated, `rng.test.ts`). Because each replicate owns its stream, a replicate's data
 * depend only on (seed, scenario, hypothesis, r) — never on which chunk or worker generated it,
 * nor on the order of the chunks. `hypothesis` separates the paired run under the planned effect
 * (`'alternative'`) from the run at zero effect (`'null'`): the two are independent streams.
 *
 * State: `state()` returns a plain object (the four 32-bit words and a pending normal deviate)
 * and `Rng.restore(state)` continues the sequence exactly where it was saved.
 *
 * Nothing here calls Math.random.
 */
import seedrandom from 'seedrandom';

/** The paired runs of one replicate: under the planned effect, and at zero effect. */
export type Hypothesis = 'alternative' | 'null';

/** Everything needed to continue a stream exactly: Tyche-i's four words and the polar method's spare deviate. */
export interface RngState {
  a: number;
  b: number;
  c: number;
  d: number;
  /** The second deviate of the last polar-method pair, not yet returned (null when there is none). */
  spareNormal: number | null;
}

/** The version tag of the stream derivation: change it only together with every stored result. */
const STREAM_VERSION = 'unitwise-sim/1';

type Tychei = seedrandom.StatefulPRNG<seedrandom.State.Tychei>;

export class Rng {
  private spare = 0;
  private hasSpare = false;

  private constructor(private readonly prng: Tychei) {}

  /** A generator seeded from any string (used by tests and by `forReplicate`). */
  static fromKey(key: string): Rng {
    return new Rng(seedrandom.tychei(key, { state: true }));
  }

  /**
   * The stream of one replicate: depends only on its arguments (see the module comment).
   * `seed` is a non-negative safe integer; `scenario` the scenario's name.
   */
  static forReplicate(seed: number, scenario: string, hypothesis: Hypothesis, replicate: number): Rng {
    if (!Number.isSafeInteger(seed) || seed < 0) throw new RangeError(`seed must be a non-negative whole number, got ${seed}`);
    if (!Number.isSafeInteger(replicate) || replicate < 0) {
      throw new RangeError(`replicate must be a non-negative whole number, got ${replicate}`);
    }
    return Rng.fromKey(JSON.stringify([STREAM_VERSION, seed, scenario, hypothesis, replicate]));
  }

  /** A generator that continues from a saved state. */
  static restore(state: RngState): Rng {
    const { a, b, c, d } = state;
    const rng = new Rng(seedrandom.tychei('', { state: { a, b, c, d } }));
    if (state.spareNormal !== null) {
      rng.spare = state.spareNormal;
      rng.hasSpare = true;
    }
    return rng;
  }

  /** The current state, a plain JSON-serialisable object. */
  state(): RngState {
    const { a, b, c, d } = this.prng.state();
    return { a, b, c, d, spareNormal: this.hasSpare ? this.spare : null };
  }

  /** A uniform deviate on the open interval (0, 1) with 53 random bits (seedrandom's `double()`). */
  uniform(): number {
    return this.prng.double();
  }

  /**
   * A standard normal deviate by Marsaglia's polar method (Marsaglia & Bray 1964, "A convenient
   * method for generating normal variables", SIAM Review 6:260–264): draw (v₁, v₂) uniform on
   * the square (−1, 1)², keep the pair when 0 < s = v₁² + v₂² < 1 (probability π/4), and return
   * v₁·√(−2 ln s / s) and, on the next call, v₂·√(−2 ln s / s). Exact (no approximation beyond
   * floating point): the two values are independent N(0, 1). Cost: 4/π ≈ 1.27 pairs of uniforms
   * per two deviates.
   */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let v1: number;
    let v2: number;
    let s: number;
    do {
      v1 = 2 * this.prng.double() - 1;
      v2 = 2 * this.prng.double() - 1;
      s = v1 * v1 + v2 * v2;
    } while (s >= 1 || s === 0);
    const factor = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v2 * factor;
    this.hasSpare = true;
    return v1 * factor;
  }
}
