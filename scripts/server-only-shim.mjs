// Stands in for the server-only marker package in the queue worker process (plain Node, no React server).
export {};
