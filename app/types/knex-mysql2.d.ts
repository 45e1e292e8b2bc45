// Knex's MariaDB/MySQL client class, subclassed by `app/lib/db.server.ts` (knex ships no types for it).
declare module "knex/lib/dialects/mysql2/index.js" {
  const Client: unknown;
  export default Client;
}
