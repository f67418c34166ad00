import { defineConfig } from 'drizzle-kit';

/** `npm run db:generate` writes SQL migrations for server/db/schema.ts into drizzle/. */
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
});
