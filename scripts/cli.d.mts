// Types of the compiled CLIs' launcher (scripts/cli.mjs, plain JavaScript so that Node starts it without tsx).
export declare const CLIS: Record<"check" | "recount", string>;
export declare function staleness(name: keyof typeof CLIS): string | null;
export declare function buildCli(name: keyof typeof CLIS): Promise<string>;
export declare function ensureCli(name: keyof typeof CLIS): Promise<string>;
