/**
 * The JSON form of a server-side type, as the app receives it: dates travel
 * as ISO strings. Hooks derive their response types from the server's with
 * `import type` (erased at build time, so no server code reaches the bundle)
 * instead of writing them out again.
 */
export type Wire<T> = T extends Date
  ? string
  : T extends readonly unknown[]
    ? { [K in keyof T]: Wire<T[K]> }
    : T extends object
      ? { [K in keyof T]: Wire<T[K]> }
      : T;
