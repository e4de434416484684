// Stands in for the `server-only` marker package in tests.
export {};
