// Stand-in for the "server-only" marker package under vitest, which runs outside React's
// server bundle (the real package throws on import there by design).
export {};
