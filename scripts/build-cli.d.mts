// Types of scripts/build-cli.mjs for the TypeScript benchmarks and tests that import it.
/** Where bin/slackline.mjs looks for the prebuilt command-line bundle. */
export declare const CLI_OUT: string;
/** Builds the bundle and its worker-thread entries into `out` (default CLI_OUT). */
export declare function buildCli(out?: string): Promise<{ entry: string; workers: string[]; inputs: number }>;
