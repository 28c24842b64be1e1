/** The engine's bundle (./bundle.mjs). */
export declare const BUNDLE: string;
export declare function bundleIsFresh(): boolean;
export declare function buildBundle(): Promise<boolean>;
export declare function ensureBundle(): Promise<boolean>;
