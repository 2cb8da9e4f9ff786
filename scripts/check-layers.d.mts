// Types of scripts/check-layers.mjs for the TypeScript tests that import it.
export interface LayerProblem {
  /** Repository-relative path with '/' separators. */
  file: string;
  /** 1-based line of the offending statement or comment. */
  line: number;
  message: string;
}
export declare const CORE_ORDER: string[][];
export declare function checkLayers(options: { root: string; files?: string[]; references?: boolean }): LayerProblem[];
