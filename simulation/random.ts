import seedrandom from 'seedrandom';

/**
 * Random streams for the projection.
 *
 * Paths are grouped in fixed-size blocks of {@link PATHS_PER_STREAM} paths. Block b draws
 * from its own stream: seedrandom's Alea generator seeded with the string
 * `keelson/<seed>/<b>`. Inside a block every path consumes exactly the same number of
 * uniforms (one per fund per year of the longest horizon), so path j of the block uses
 * uniforms [j·D, (j+1)·D) of the stream and any range of paths can be computed alone by
 * skipping ahead. With antithetic variates paths 2k and 2k+1 share one draw set (the
 * second negates the normals), so draw set k = floor(path / 2).
 *
 * Alea returns multiples of 2^-32 in [0, 1); {@link toOpenUnit} shifts them by half a step
 * into (0, 1) so the normal quantile is always finite.
 */
export const PATHS_PER_STREAM = 256;

/** Saved generator state (Alea's four numbers). */
export interface StreamState {
  c: number;
  s0: number;
  s1: number;
  s2: number;
}

/** A seeded uniform generator with save/restore. */
export interface RandomStream {
  /** Next uniform in [0, 1), a multiple of 2^-32. */
  next: () => number;
  /** Snapshot of the current state. */
  save(): StreamState;
  /** Continue from a snapshot taken by {@link RandomStream.save}. */
  restore(state: StreamState): void;
}

/** The seed string of stream `index` of a run seeded with `seed`. */
export function streamSeed(seed: number, index: number): string {
  return `keelson/${seed}/${index}`;
}

class AleaStream implements RandomStream {
  next: () => number;
  private prng: seedrandom.StatefulPRNG<seedrandom.State.Alea>;

  constructor(seedText: string) {
    this.prng = seedrandom.alea(seedText, { state: true });
    this.next = this.prng;
  }

  save(): StreamState {
    const s = this.prng.state();
    return { c: s.c, s0: s.s0, s1: s.s1, s2: s.s2 };
  }

  restore(state: StreamState): void {
    this.prng = seedrandom.alea('', { state: { ...state } });
    this.next = this.prng;
  }
}

/** Stream number `index` of a run with this seed (see the module comment). */
export function createStream(seed: number, index: number): RandomStream {
  return new AleaStream(streamSeed(seed, index));
}

/** Map a uniform on the 2^-32 grid of [0, 1) into the open interval (0, 1). */
export function toOpenUnit(u: number): number {
  return u + 1.1641532182693481e-10; // half of 2^-32
}
