/** Seeded pseudo-random numbers: the same seed always gives the same layout or demo season. */
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { uniformInt } from 'pure-rand/distribution/uniformInt';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

export interface Random {
  /** Integer in [from, to], both included. */
  int(from: number, to: number): number;
  /** Float in [0, 1). */
  float(): number;
  /** Normal deviate (Box–Muller). */
  normal(mean?: number, sd?: number): number;
  shuffle<T>(items: readonly T[]): T[];
}

export function createRandom(seed: number): Random {
  const rng = xoroshiro128plus(seed | 0);
  const float = () => uniformFloat64(rng);
  return {
    int: (from, to) => uniformInt(rng, from, to),
    float,
    normal(mean = 0, sd = 1) {
      const u = 1 - float();
      const v = float();
      return mean + sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
    shuffle(items) {
      const out = [...items];
      // Fisher–Yates
      for (let i = out.length - 1; i > 0; i--) {
        const j = uniformInt(rng, 0, i);
        [out[i], out[j]] = [out[j]!, out[i]!];
      }
      return out;
    },
  };
}
