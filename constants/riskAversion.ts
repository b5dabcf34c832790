/**
 * The board's risk aversion λ (mean–variance utility U = E[r] − λ·Var; the engine uses CRRA with
 * γ = 2λ, see simulation/utility.ts). Two ranges exist, on purpose:
 *
 * - **The board's range, below** — what a run or a report may be requested at over the API, what
 *   the λ control on screen offers, and the interval searched for break-even λ and named in the
 *   sentences about it. It spans risk seeking (λ < 0) to far more cautious than any board we
 *   expect (common practice, no source).
 * - **The engine's range**, λ ∈ [−50, 500] in `simulation/schema.ts` — what a scenario file may
 *   carry (a public format, run from the command line too). It is wider so that research
 *   scenarios still validate; the board's range lies inside it (tests/unit/constants.test.ts).
 */
export const BOARD_LAMBDA = {
  min: -5,
  max: 50,
  /** λ of a new run when none is chosen. */
  default: 2,
  /** Values offered as one-tap choices. */
  presets: [-1, 0, 1, 2, 3, 5, 8],
  /** Step of the − / + buttons. */
  step: 0.5,
} as const;

/** λ held to the board's range and to one decimal, as the control shows it. */
export function clampLambda(v: number): number {
  return Math.min(BOARD_LAMBDA.max, Math.max(BOARD_LAMBDA.min, Math.round(v * 10) / 10));
}

/** The board's range as the [low, high] pair the engine's break-even search takes. */
export const BOARD_LAMBDA_RANGE: readonly [number, number] = [BOARD_LAMBDA.min, BOARD_LAMBDA.max];
