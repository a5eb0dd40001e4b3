// Types of bin/builtCli.mjs for the TypeScript that imports it (the build plugin, the test, the bench).
export declare const PROJECT_ROOT: string;
export declare const CLI_OUT_DIR: string;
export declare const CLI_BUNDLE: string;
export declare const CLI_BUNDLE_CJS: string;
export declare const CLI_CODE_CACHE: string;
export declare const CLI_BUILD_INFO: string;
export declare const CLI_ENTRIES: { meanward: string; simulationThread: string };
export declare const CLI_BUILD_INPUTS: string[];
export declare const CLI_BUILD_INFO_FORMAT: number;
export declare const REBUILD_COMMAND: string;
export interface CliBuildInfo {
  format: number;
  builtAt: number;
  entries: string[];
  files: Record<string, string>;
  fingerprint: string;
}
export declare function presentCliEntries(root?: string): Record<string, string>;
export declare function digestOf(content: string | Uint8Array): string;
export declare function fingerprintOf(entries: string[], files: Record<string, string>): string;
export declare function readCliBuildInfo(root?: string): CliBuildInfo | null;
export declare function builtCliState(root?: string): { state: 'current' } | { state: 'missing' | 'stale'; why: string };
export declare function cliFingerprintNow(root?: string): { recorded: string; now: string; changed: string[]; entriesNow: string[] } | null;
export declare function loadBuiltCli(
  root?: string,
  options?: { useCache?: boolean },
): { cli: { main: (argv: string[], io: object) => Promise<number> }; script: import('node:vm').Script; codeCache: 'accepted' | 'rejected' | 'absent' };
