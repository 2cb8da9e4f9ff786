// Types of scripts/build-wasm.mjs for the TypeScript tests that import it.
/** The text of core/solver/march-wasm.ts for the module bytes. */
export declare function moduleText(bytes: Uint8Array): string;
/** Assembles core/solver/march.wat and returns the text core/solver/march-wasm.ts should hold. */
export declare function assemble(): Promise<string>;
