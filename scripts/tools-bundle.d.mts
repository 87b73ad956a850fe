// Types of scripts/tools-bundle.mjs (plain JavaScript so the launcher needs no TypeScript loader).
export declare const root: string;
export declare const TOOL_ENTRIES: Record<string, string>;
export declare function toolsDir(dir?: string): string;
export declare function toolFile(name: string, dir?: string): string;
export declare function bundleNeeded(dir?: string): string | null;
export declare function bundleTools(dir?: string): Promise<void>;
export declare function ensureToolsBundle(dir?: string): Promise<string | null>;
export declare const STALE_CHUNK_MS: number;
export declare function removeStaleChunks(out: string, written: string[]): void;
