/**
 * Version of the projection engine, stamped on every result. Bump on any change that alters
 * results. 2.0.0: scenario format 2 (new random numbers, timing conventions, contribution
 * basis), standard errors and comparisons; format-1 scenarios keep engine 1's figures.
 */
export const ENGINE_VERSION = '2.0.0';

/** Newest version of the scenario and result JSON formats described in simulation/README.md. */
export const FORMAT_VERSION = 2;
