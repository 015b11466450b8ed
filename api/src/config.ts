import { z } from 'zod';

/** API settings, parsed once at start; nothing else reads process.env. */
const schema = z.object({
  PORT: z.coerce.number().int().min(1).max(65535).default(3000).describe('port of the web app and API on 127.0.0.1'),
  HOST: z.string().default('127.0.0.1').describe('address to listen on'),
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  WEB_DIST: z.string().optional().describe('folder of the built web app (default web/dist)'),
});

export type ApiConfig = z.infer<typeof schema>;

export function readApiConfig(env: NodeJS.ProcessEnv = process.env): ApiConfig {
  return schema.parse(env);
}
