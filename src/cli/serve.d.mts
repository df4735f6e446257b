// Types for serve.mjs (plain JavaScript so `npm start` needs no build step).
import type { IncomingMessage, Server, ServerResponse } from 'node:http';
export const CONTENT_SECURITY_POLICY: string;
export function mimeType(path: string): string;
export function appIsStale(): boolean;
export function buildApp(log?: (s: string) => void): void;
export function handler(root?: string): (req: IncomingMessage, res: ServerResponse) => void;
export function startServer(opts?: { port?: number; host?: string; build?: boolean; log?: (s: string) => void }): Promise<{ server: Server; port: number; url: string; close: () => Promise<void> }>;
