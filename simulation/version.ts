/** Version of the projection engine, stamped on every result. Bump on any change that alters results. */
export const ENGINE_VERSION = '1.0.0';

/** Version of the scenario and result JSON formats described in simulation/README.md. */
export const FORMAT_VERSION = 1;
