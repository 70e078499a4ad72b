/** Version of the analysis engine, reported in every result (`engine`). */
export const ENGINE_VERSION = "0.1.0";
