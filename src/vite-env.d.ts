/** The package version, written in at build time (vite.config.ts `define`). */
declare const __APP_VERSION__: string;
