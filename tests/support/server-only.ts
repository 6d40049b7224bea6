// Stand-in for the "server-only" marker package when modules run outside Next.js.
export {};
