// Stands in for the "server-only" package under vitest, where no React server condition is set.
export {};
