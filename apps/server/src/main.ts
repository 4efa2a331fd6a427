import { createApp } from './app.factory.js';
import { ConfigError, loadConfig } from './config/config.js';
import { DemoService } from './demo/demo.service.js';

async function main(): Promise<void> {
  const config = loadConfig();
  const { app } = await createApp(config);
  // Lifecycle hooks first (the development mail relay among them), so the demo's signed codes
  // can send their mail while the demo loads.
  await app.init();
  if (config.demo) await app.get(DemoService).seedIfEmpty();
  if (config.host) await app.listen(config.port, config.host);
  else await app.listen(config.port);
  process.stdout.write(
    JSON.stringify({ level: 'info', msg: `Steadyhand is serving on ${config.publicOrigin}`, port: config.port, dataDir: config.dataDir, demo: config.demo }) + '\n',
  );
}

main().catch((err: unknown) => {
  process.stderr.write((err instanceof ConfigError ? err.message : err instanceof Error ? (err.stack ?? err.message) : String(err)) + '\n');
  process.exit(1);
});
