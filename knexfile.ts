import { existsSync } from "node:fs";
import type { Knex } from "knex";

if (existsSync(".env")) process.loadEnvFile(".env");

// Migrations, seeds, benchmarks and the tests' set-up connect as the migration account, which owns the
// schema; the app itself connects as DB_USER (app/lib/db.server.ts), which may only read and write rows.
const config: Knex.Config = {
  client: "mysql2",
  connection: {
    host: process.env.DB_HOST ?? "127.0.0.1",
    port: Number(process.env.DB_PORT ?? 3307),
    user: process.env.DB_MIGRATION_USER || "foamtally_migrate",
    password: process.env.DB_MIGRATION_PASSWORD ?? "",
    database: process.env.DB_NAME ?? "foamtally",
    charset: "utf8mb4",
    timezone: "Z",
    dateStrings: false,
    decimalNumbers: false,
  },
  pool: { min: 0, max: 10 },
  migrations: { directory: "./migrations", extension: "ts", loadExtensions: [".ts"] },
  seeds: { directory: "./seeds", extension: "ts", loadExtensions: [".ts"] },
};

export default config;
