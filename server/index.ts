// The web server process: API and built client.
import { createServer } from 'node:http';
import { parseEnv } from './env';
import { openDb } from './db/client';
import { createStorage } from './storage';
import { createMailer } from './mail';
import { startQueue } from './queue';
import { createApp } from './app';

const env = parseEnv();
const log = (m: string) => console.log(`[server] ${m}`);
const { db, pool } = openDb(env.DATABASE_URL, { log, role: env.DATABASE_APP_ROLE });
const storage = createStorage(env);
const mailer = createMailer(env);
const boss = await startQueue(env.DATABASE_URL);
const { app, close } = createApp({ env, db, pool, storage, mailer, boss, log });
const server = createServer(app);
server.listen(env.PORT, env.HOST, () => log(`listening on http://${env.HOST}:${env.PORT}`));

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  server.close();
  close();
  await boss.stop({ graceful: false, wait: true }).catch(() => undefined);
  mailer.close();
  storage.close();
  await pool.end();
  process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
