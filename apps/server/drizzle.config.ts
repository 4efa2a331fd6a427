import { defineConfig } from 'drizzle-kit';

// Migrations are generated into the top-level drizzle/ folder and committed.
export default defineConfig({
  dialect: 'sqlite',
  schema: './src/db/schema/*.ts',
  out: '../../drizzle',
  strict: true,
  verbose: true,
});
